import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, RefTo } from '../db/columns';
import type { FigureVersionDto, Recipe } from '@psiform/contracts';
import { FigureEntity } from './figure.entity';
import { UserEntity } from '../users/user.entity';

/**
 * One numbered state of a figure: the validated, defaults-filled recipe and its hash. Versions are only
 * ever inserted; a locked one (submitted for review: a proof) is never modified (FiguresService).
 */
@Entity({ name: 'figure_versions' })
export class FigureVersionEntity {
  @IdColumn() id: string;
  @UuidColumn('figure_id') figureId: string;
  @RefTo(() => FigureEntity, 'figure_id', 'CASCADE') figure?: FigureEntity;
  @Column({ type: 'int' }) number: number;
  @Column({ type: 'jsonb' }) recipe: Recipe;
  /** sha256 (hex) of canonicalJson(recipe). */
  @Column({ name: 'recipe_hash', type: 'char', length: 64 }) recipeHash: string;
  @Column({ name: 'engine_version', type: 'varchar', length: 80 }) engineVersion: string;
  @UuidColumn('author_id') authorId: string;
  @RefTo(() => UserEntity, 'author_id', 'RESTRICT') author?: UserEntity;
  @Column({ type: 'boolean', default: false }) locked: boolean;
  @CreatedAt() createdAt: Date;
}

export function toFigureVersionDto(v: FigureVersionEntity): FigureVersionDto {
  return {
    id: v.id,
    figureId: v.figureId,
    number: v.number,
    recipe: v.recipe,
    engineVersion: v.engineVersion,
    authorId: v.authorId,
    locked: v.locked,
    createdAt: v.createdAt.toISOString(),
  };
}
