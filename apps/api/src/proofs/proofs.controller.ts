import { Controller, Get, Param, Post, Query } from '@nestjs/common';
import type { CreateJobResponse, FigureVersionSummaryDto, UserDto, VersionComparisonDto } from '@psiform/contracts';
import { CurrentUser } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { intParam } from '../common/int-param.pipe';
import { CompareQuery } from './proofs.dto';
import { ProofsService } from './proofs.service';

@Controller('figures')
export class ProofsController {
  constructor(private readonly proofs: ProofsService) {}

  @Get(':id/versions')
  versions(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<FigureVersionSummaryDto[]> {
    return this.proofs.versions(user, id);
  }

  @Get(':id/compare')
  compare(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Query() q: CompareQuery): Promise<VersionComparisonDto> {
    return this.proofs.compare(user, id, q.from, q.to);
  }

  /** A print-size render of one version (the recipe's own canvas), for proofs that have none yet. */
  @Post(':id/versions/:number/render')
  render(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Param('number', intParam('number', 'a version number (an integer)')) n: number): Promise<CreateJobResponse> {
    return this.proofs.renderVersion(user, id, n);
  }
}
