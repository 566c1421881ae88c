import { Controller, Get, Query } from '@nestjs/common';
import type { Page, SubjectAuditEntryDto } from '@psiform/contracts';
import { Roles } from '../auth/auth.decorators';
import { AuditService } from './audit.service';
import { SubjectAuditQuery } from './audit.dto';

/** The audit of users, publications and house styles (figures have GET /api/figures/:id/audit). */
@Controller('audit')
@Roles('admin')
export class SubjectAuditController {
  constructor(private readonly audit: AuditService) {}

  @Get()
  list(@Query() query: SubjectAuditQuery): Promise<Page<SubjectAuditEntryDto>> {
    return this.audit.forSubjects(query);
  }
}
