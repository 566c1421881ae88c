import { Transform, Type } from 'class-transformer';
import { IsDefined, IsIn, IsInt, IsNotEmpty, IsString, IsUUID, Max, MaxLength, Min, type ValidationArguments } from 'class-validator';
import { OptionalNotNull } from '../common/validation';
import { FIGURE_STATUSES, TEXT_LIMITS, titleProblem, type CreateFigureRequest, type FigureStatus, type UpdateFigureRequest } from '@psiform/contracts';
import { FIGURE_SORTS, type FigureSort } from '@psiform/server';

const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

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
  @IsIn(FIGURE_STATUSES as readonly string[], { message: `status must be one of: ${FIGURE_STATUSES.join(', ')}` })
  status?: FigureStatus;

  @OptionalNotNull()
  @IsIn(FIGURE_SORTS as readonly string[], { message: `sort must be one of: ${FIGURE_SORTS.join(', ')}` })
  sort?: FigureSort;

  @OptionalNotNull()
  @IsIn(['asc', 'desc'], { message: 'order must be asc or desc' })
  order?: 'asc' | 'desc';
}
