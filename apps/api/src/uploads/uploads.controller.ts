import { Controller, Post, Req } from '@nestjs/common';
import type { Request } from 'express';
import type { UploadResponse, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { UploadsService } from './uploads.service';

@Controller('uploads')
export class UploadsController {
  constructor(private readonly uploads: UploadsService) {}

  /** multipart/form-data: publicationId, title, format, [quantity], [fraction], [sidecar], cube. */
  @Post()
  @Roles('illustrator', 'admin')
  upload(@CurrentUser() user: UserDto, @Req() req: Request): Promise<UploadResponse> {
    return this.uploads.receive(user, req);
  }
}
