import { Controller, Get, Param, Redirect } from '@nestjs/common';
import type { AssetLinkDto, UserDto } from '@psiform/contracts';
import { CurrentUser } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { AssetsService } from './assets.service';

@Controller('assets')
export class AssetsController {
  constructor(private readonly assets: AssetsService) {}

  @Get(':id/link')
  link(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<AssetLinkDto> {
    return this.assets.link(user, id);
  }

  /** 302 to the presigned URL (the file itself never passes through the api). */
  @Get(':id/download')
  @Redirect()
  async download(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<{ url: string; statusCode: number }> {
    return { url: (await this.assets.link(user, id)).url, statusCode: 302 };
  }
}
