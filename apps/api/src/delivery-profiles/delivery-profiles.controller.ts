import { Body, Controller, Get, HttpCode, Param, Post, Put } from '@nestjs/common';
import type { DeliveryProfileDto, FigurePreflightDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { FiguresService } from '../figures/figures.service';
import { DeliveryProfilesService } from './delivery-profiles.service';

/** A publication's delivery profile: members read it; its art directors (and admins) set it. */
@Controller('publications')
export class DeliveryProfilesController {
  constructor(private readonly profiles: DeliveryProfilesService) {}

  @Get(':id/delivery-profile')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<DeliveryProfileDto> {
    return this.profiles.get(user, id);
  }

  @Put(':id/delivery-profile')
  @Roles('art_director', 'admin')
  put(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: unknown): Promise<DeliveryProfileDto> {
    return this.profiles.put(user, id, body);
  }
}

/** Press conditions (assets/icc) and swatch checks on them, for the swatchbook editor. */
@Controller('press-conditions')
export class PressConditionsController {
  constructor(private readonly profiles: DeliveryProfilesService) {}

  @Get()
  list() {
    return this.profiles.pressConditions();
  }

  @Post(':id/check')
  @HttpCode(200)
  check(@Param('id') id: string, @Body() body: unknown) {
    return this.profiles.checkPress(id, body);
  }
}

/** The current version's preflight reports and whether they block approval. */
@Controller('figures')
export class FigurePreflightController {
  constructor(
    private readonly profiles: DeliveryProfilesService,
    private readonly figures: FiguresService,
  ) {}

  @Get(':id/preflight')
  async get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<FigurePreflightDto> {
    const figure = await this.figures.requireFigure(user, id);
    return this.profiles.figurePreflight(user, id, figure.publicationId);
  }
}
