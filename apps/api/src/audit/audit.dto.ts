import { IsOptional, IsUUID } from 'class-validator';
import { AdminPage, AdminPageSize, OneOf } from '../common/validation';

export const SUBJECT_KINDS = ['user', 'publication', 'house_style'] as const;

export class SubjectAuditQuery {
  @IsOptional()
  @OneOf(SUBJECT_KINDS)
  subjectKind?: (typeof SUBJECT_KINDS)[number];

  @IsOptional()
  @IsUUID('all', { message: 'subjectId must be a UUID' })
  subjectId?: string;

  @AdminPage()
  page?: number;

  @AdminPageSize()
  pageSize?: number;
}
