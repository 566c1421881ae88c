import type { DataSourceOptions } from 'typeorm';
import { UserEntity } from '../users/user.entity';
import { PublicationEntity } from '../publications/publication.entity';
import { MembershipEntity } from '../publications/membership.entity';
import { Foundation1764633600000 } from './migrations/1764633600000-Foundation';

/** Entities and migrations are listed as classes (not globs) so the same list works compiled and under Jest. */
export const ENTITIES = [UserEntity, PublicationEntity, MembershipEntity];
export const MIGRATIONS = [Foundation1764633600000];

export function dataSourceOptions(url: string): DataSourceOptions {
  return {
    type: 'postgres',
    url,
    entities: ENTITIES,
    migrations: MIGRATIONS,
    migrationsTableName: 'typeorm_migrations',
    synchronize: false,
    migrationsRun: false,
    logging: ['error'],
  };
}
