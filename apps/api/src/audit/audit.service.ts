import { Injectable, NotFoundException } from '@nestjs/common';
import { ADMIN_PAGE_SIZE, type AuditEntryDto, type Page, type SubjectAuditEntryDto, type UserDto } from '@psiform/contracts';
import { MembershipService } from '../publications/membership.service';
import { ReviewsStore, AuditStore, toAuditEntryDto, toSubjectAuditEntryDto } from '@psiform/server';
import type { SubjectAuditQuery } from './audit.dto';

@Injectable()
export class AuditService {
  constructor(
    private readonly store: AuditStore,
    private readonly figures: ReviewsStore,
    private readonly membership: MembershipService,
  ) {}

  /** The figure's audit log in the order it was written; 404 for non-members. */
  async forFigure(user: Pick<UserDto, 'id' | 'role'>, figureId: string): Promise<AuditEntryDto[]> {
    const figure = await this.figures.findFigure(figureId);
    if (!figure || !(await this.membership.canAccess(user, figure.publicationId))) throw new NotFoundException(`figure ${figureId} not found`);
    return (await this.store.listForFigure(figureId)).map(({ entry, actorName }) => toAuditEntryDto(entry, actorName));
  }

  /** Entries about users, publications and house styles, newest first (admins). */
  async forSubjects(q: SubjectAuditQuery): Promise<Page<SubjectAuditEntryDto>> {
    const page = q.page ?? 1;
    const pageSize = q.pageSize ?? ADMIN_PAGE_SIZE.default;
    const { rows, total } = await this.store.listForSubjects({ subjectKind: q.subjectKind, subjectId: q.subjectId, page, pageSize });
    return { items: rows.map(({ entry, actorName }) => toSubjectAuditEntryDto(entry, actorName)), total, page, pageSize };
  }
}
