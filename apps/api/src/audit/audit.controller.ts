import { Controller, Get, Param } from '@nestjs/common';
import type { AuditEntryDto, UserDto } from '@psiform/contracts';
import { CurrentUser } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { AuditService } from './audit.service';

@Controller('figures')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

  @Get(':id/audit')
  list(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<AuditEntryDto[]> {
    return this.audit.forFigure(user, id);
  }
}
