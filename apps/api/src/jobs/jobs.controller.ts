import { Controller, Get, Param, Req, Res } from '@nestjs/common';
import type { Request, Response } from 'express';
import type { JobDto, UserDto } from '@psiform/contracts';
import { CurrentUser } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { streamSse } from '../common/sse';
import { JobsService } from './jobs.service';

@Controller('jobs')
export class JobsController {
  constructor(private readonly jobs: JobsService) {}

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<JobDto> {
    return this.jobs.get(user, id);
  }

  /** text/event-stream of JobDto snapshots; 404 (plain JSON) before any stream for non-members. */
  @Get(':id/events')
  async events(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Req() req: Request, @Res() res: Response): Promise<void> {
    await this.jobs.requireJob(user, id);
    await streamSse(req, res, (signal) => this.jobs.watch(id, { signal }));
  }
}
