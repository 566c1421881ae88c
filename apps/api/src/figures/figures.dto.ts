import { Transform, Type } from 'class-transformer';
import { IsDefined, IsInt, IsNotEmpty, IsString, IsUUID, Max, MaxLength, Min, type ValidationArguments } from 'class-validator';
import { OneOf, OptionalNotNull, SortOrder, trim } from '../common/validation';
import { FIGURE_SORT_KEYS, FIGURE_STATUSES, TEXT_LIMITS, titleProblem, type CreateFigureRequest, type FigureSortKey, type FigureStatus, type UpdateFigureRequest } from '@psiform/contracts';


/** From libs/contracts, so the client names the same limit in the same words. */
export const FIGURE_TITLE_MAX = TEXT_LIMITS.titleMax;
const titleTooLong = (a: ValidationArguments) => `title ${titleProblem(a.value) ?? `must be at most ${FIGURE_TITLE_MAX} characters`}`;
/** Highest page number a list accepts: keeps (page - 1) × pageSize far inside PostgreSQL's bigint OFFSET. */
export const PAGE_MAX = 1_000_000;

export class CreateFigureBody implements CreateFigureRequest {
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId: string;

  @Transform(trim)
  @IsNotEmpty({ message: 'title must not be empty' })
  @MaxLength(FIGURE_TITLE_MAX, { message: titleTooLong })
  @IsString({ message: 'title must be a string' })
  title: string;

  /** Checked by parseRecipe in the service (messages name recipe.<path>). */
  @IsDefined({ message: 'recipe is required' })
  recipe: unknown;
}

export class UpdateFigureBody implements UpdateFigureRequest {
  @OptionalNotNull()
  @Transform(trim)
  @IsNotEmpty({ message: 'title must not be empty' })
  @MaxLength(FIGURE_TITLE_MAX, { message: titleTooLong })
  @IsString({ message: 'title must be a string' })
  title?: string;

  @OptionalNotNull()
  recipe?: unknown;
}


export class ListFiguresQuery {
  @OptionalNotNull()
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId?: string;

  @OptionalNotNull()
  @Type(() => Number)
  @Min(1, { message: `page must be 1..${PAGE_MAX}` })
  @Max(PAGE_MAX, { message: `page must be 1..${PAGE_MAX}` })
  @IsInt({ message: 'page must be an integer' })
  page?: number;

  @OptionalNotNull()
  @Type(() => Number)
  @Min(1, { message: 'pageSize must be 1..100' })
  @Max(100, { message: 'pageSize must be 1..100' })
  @IsInt({ message: 'pageSize must be an integer' })
  pageSize?: number;

  @OptionalNotNull()
  @MaxLength(200, { message: 'q must be at most 200 characters' })
  @IsString({ message: 'q must be a string' })
  q?: string;

  @OptionalNotNull()
  @OneOf(FIGURE_STATUSES)
  status?: FigureStatus;

  @OptionalNotNull()
  @OneOf(FIGURE_SORT_KEYS)
  sort?: FigureSortKey;

  @SortOrder(OptionalNotNull())
  order?: 'asc' | 'desc';
}
