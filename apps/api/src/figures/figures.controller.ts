import { Body, Controller, Get, Param, Patch, Post, Query } from '@nestjs/common';
import type { CreateJobResponse, FigureDto, FigureSummaryDto, Page, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { CreateFigureBody, ListFiguresQuery, UpdateFigureBody } from './figures.dto';
import { FiguresService } from './figures.service';

/** Illustrators and admins create, edit and queue; every member of the publication reads. */
@Controller('figures')
export class FiguresController {
  constructor(private readonly figures: FiguresService) {}

  @Post()
  @Roles('illustrator', 'admin')
  create(@CurrentUser() user: UserDto, @Body() body: CreateFigureBody): Promise<FigureDto> {
    return this.figures.create(user, body);
  }

  @Get()
  list(@CurrentUser() user: UserDto, @Query() query: ListFiguresQuery): Promise<Page<FigureSummaryDto>> {
    return this.figures.list(user, query);
  }

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<FigureDto> {
    return this.figures.get(user, id);
  }

  @Patch(':id')
  @Roles('illustrator', 'admin')
  update(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: UpdateFigureBody): Promise<FigureDto> {
    return this.figures.update(user, id, body);
  }

  @Post(':id/meshes')
  @Roles('illustrator', 'admin')
  mesh(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<CreateJobResponse> {
    return this.figures.requestMesh(user, id);
  }
}
