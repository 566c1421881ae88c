import { Type } from 'class-transformer';
import { IsIn, IsInt, IsOptional, IsUUID, Max, Min } from 'class-validator';
import { ADMIN_PAGE_SIZE } from '@psiform/contracts';

export const SUBJECT_KINDS = ['user', 'publication', 'house_style'] as const;

export class SubjectAuditQuery {
  @IsOptional()
  @IsIn(SUBJECT_KINDS as readonly string[], { message: `subjectKind must be one of: ${SUBJECT_KINDS.join(', ')}` })
  subjectKind?: (typeof SUBJECT_KINDS)[number];

  @IsOptional()
  @IsUUID('all', { message: 'subjectId must be a UUID' })
  subjectId?: string;

  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'page must be an integer' })
  @Min(1, { message: 'page must be 1..100000' })
  @Max(100_000, { message: 'page must be 1..100000' })
  page?: number;

  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'pageSize must be an integer' })
  @Min(1, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  @Max(ADMIN_PAGE_SIZE.max, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  pageSize?: number;
}
