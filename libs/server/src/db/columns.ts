import { Column, CreateDateColumn, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, type ObjectType } from 'typeorm';

/**
 * Column decorators in the schema's one convention (uuid keys, snake_case column names, timestamptz times), so an
 * entity states only what is particular to it. Each is exactly the TypeORM decorator(s) it stands for.
 */
export const IdColumn = (): PropertyDecorator => PrimaryGeneratedColumn('uuid');

/** A uuid column (usually a foreign key), `nullable` when the reference is optional. */
export const UuidColumn = (name: string, nullable = false): PropertyDecorator => Column({ name, type: 'uuid', nullable });

export const CreatedAt = (): PropertyDecorator => CreateDateColumn({ name: 'created_at', type: 'timestamptz' });
export const UpdatedAt = (): PropertyDecorator => UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' });

/** The relation behind a foreign-key column (ManyToOne + JoinColumn), with what a delete of the target does. */
export function RefTo<T>(target: () => ObjectType<T>, column: string, onDelete: 'CASCADE' | 'SET NULL' | 'RESTRICT'): PropertyDecorator {
  return (proto, key) => {
    ManyToOne(target, { onDelete })(proto, key);
    JoinColumn({ name: column })(proto, key);
  };
}
