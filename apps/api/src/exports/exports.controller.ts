import { Body, Controller, Get, Param, Post, Query } from '@nestjs/common';
import type { CreateFigureSetRequest, CreateJobResponse, FigureSetDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { ExportsService } from './exports.service';

/** Bodies are checked by parseExportRequest / checkSetBody in the service (one union type; messages name the field). */
@Controller()
export class ExportsController {
  constructor(private readonly exports: ExportsService) {}

  @Post('figures/:id/exports')
  @Roles('illustrator', 'editor', 'art_director', 'admin')
  exportFigure(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: Record<string, unknown>): Promise<CreateJobResponse> {
    return this.exports.requestExport(user, id, body);
  }

  @Post('figure-sets')
  @Roles('illustrator', 'editor', 'art_director', 'admin')
  createSet(@CurrentUser() user: UserDto, @Body() body: Record<string, unknown>): Promise<FigureSetDto> {
    return this.exports.createSet(user, body as unknown as CreateFigureSetRequest);
  }

  @Get('figure-sets')
  listSets(@CurrentUser() user: UserDto, @Query('publicationId') publicationId: unknown): Promise<FigureSetDto[]> {
    return this.exports.listSets(user, publicationId);
  }

  @Get('figure-sets/:id')
  getSet(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<FigureSetDto> {
    return this.exports.getSet(user, id);
  }

  @Post('figure-sets/:id/exports')
  @Roles('illustrator', 'editor', 'art_director', 'admin')
  exportSet(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: Record<string, unknown>): Promise<CreateJobResponse> {
    return this.exports.requestSetExport(user, id, body);
  }
}
