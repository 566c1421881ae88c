import { Body, Controller, Get, HttpCode, Param, Patch, Post, Put, Query, Res } from '@nestjs/common';
import type { Response } from 'express';
import type { BatchDto, HouseStyleDto, HouseStyleImpactDto, SwatchbookCheckDto, SwatchbookDto, SwatchbookVersionDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { CreateSwatchbookBody, HouseStyleBody, HouseStyleImpactQuery, ImportSwatchbookBody, ListSwatchbooksQuery, RerenderBody, UpdateSwatchbookBody } from './swatchbooks.dto';
import { SwatchbooksService } from './swatchbooks.service';
import { RerenderService } from './rerender.service';

/** Swatchbooks belong to a publication (or a publisher): members read them, its art directors (and admins) write. */
@Controller('swatchbooks')
export class SwatchbooksController {
  constructor(private readonly swatchbooks: SwatchbooksService) {}

  @Post()
  @Roles('art_director', 'admin')
  create(@CurrentUser() user: UserDto, @Body() body: CreateSwatchbookBody): Promise<SwatchbookDto> {
    return this.swatchbooks.create(user, body);
  }

  @Post('import')
  @Roles('art_director', 'admin')
  import(@CurrentUser() user: UserDto, @Body() body: ImportSwatchbookBody): Promise<SwatchbookDto> {
    return this.swatchbooks.import(user, { ...body });
  }

  /** The swatchbooks of the caller's publications (and their publishers); ?publicationId= those usable there. */
  @Get()
  list(@CurrentUser() user: UserDto, @Query() query: ListSwatchbooksQuery): Promise<SwatchbookDto[]> {
    return this.swatchbooks.list(user, query.publicationId);
  }

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<SwatchbookDto> {
    return this.swatchbooks.get(user, id);
  }

  @Patch(':id')
  @Roles('art_director', 'admin')
  update(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: UpdateSwatchbookBody): Promise<SwatchbookDto> {
    return this.swatchbooks.update(user, id, body);
  }

  @Post(':id/lock')
  @HttpCode(200)
  @Roles('art_director', 'admin')
  lock(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<SwatchbookDto> {
    return this.swatchbooks.setLocked(user, id, true);
  }

  @Post(':id/unlock')
  @HttpCode(200)
  @Roles('art_director', 'admin')
  unlock(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<SwatchbookDto> {
    return this.swatchbooks.setLocked(user, id, false);
  }

  @Get(':id/versions')
  versions(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<SwatchbookVersionDto[]> {
    return this.swatchbooks.versions(user, id);
  }

  @Get(':id/checks')
  checks(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<SwatchbookCheckDto> {
    return this.swatchbooks.checks(user, id);
  }

  /** The swatchbook as a JSON file (POST /api/swatchbooks/import takes it back). */
  @Get(':id/export')
  async export(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Res({ passthrough: true }) res: Response): Promise<unknown> {
    const file = await this.swatchbooks.exportFile(user, id);
    const safe = file.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'swatchbook';
    res.setHeader('Content-Disposition', `attachment; filename="${safe}.swatchbook.json"`);
    return file;
  }
}

@Controller('publications')
export class HouseStyleController {
  constructor(
    private readonly swatchbooks: SwatchbooksService,
    private readonly rerenders: RerenderService,
  ) {}

  @Get(':id/house-style')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<HouseStyleDto> {
    return this.swatchbooks.getHouseStyle(user, id);
  }

  /** What pinning a swatchbook (for=pin) or a batch re-render (for=rerender) would do: the colour checks and every figure. */
  @Get(':id/house-style/impact')
  impact(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Query() q: HouseStyleImpactQuery): Promise<HouseStyleImpactDto> {
    return this.swatchbooks.impact(user, id, q.for, q.swatchbookId);
  }

  /** Pins or changes the house style; a (new) pin is gated by the swatchbook's colour checks (body override: { reason }). */
  @Put(':id/house-style')
  @Roles('art_director', 'admin')
  put(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: HouseStyleBody): Promise<HouseStyleDto> {
    return this.swatchbooks.putHouseStyle(user, id, body);
  }

  /** Batch re-render with the pinned swatchbook's current colours (gated by its colour checks; body override: { reason }). */
  @Post(':id/rerender')
  @Roles('art_director', 'admin')
  rerender(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: RerenderBody): Promise<BatchDto> {
    return this.rerenders.rerender(user, id, body?.override);
  }
}

@Controller('batches')
export class BatchesController {
  constructor(private readonly rerenders: RerenderService) {}

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<BatchDto> {
    return this.rerenders.get(user, id);
  }
}
