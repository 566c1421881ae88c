import { Module } from '@nestjs/common';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsModule } from '../assets/assets.module';
import { FiguresModule } from '../figures/figures.module';
import { UploadsService } from './uploads.service';
import { UploadsController } from './uploads.controller';
import { UploadOrphanSweeper } from './orphan-sweeper';

@Module({ imports: [PublicationsModule, AssetsModule, FiguresModule], controllers: [UploadsController], providers: [UploadsService, UploadOrphanSweeper] })
export class UploadsModule {}
