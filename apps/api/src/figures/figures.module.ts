import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { FIGURES_ENTITIES, FiguresStore, TypeormFiguresStore } from '@psiform/server';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsModule } from '../assets/assets.module';
import { JobsModule } from '../jobs/jobs.module';
import { FiguresService } from './figures.service';
import { FiguresController } from './figures.controller';

/** Figures and their versions (FiguresService.saveVersion is the one writer of versions; other features import this module). */
@Module({
  imports: [TypeOrmModule.forFeature(FIGURES_ENTITIES), PublicationsModule, AssetsModule, JobsModule],
  controllers: [FiguresController],
  providers: [{ provide: FiguresStore, useClass: TypeormFiguresStore }, FiguresService],
  exports: [FiguresService, FiguresStore],
})
export class FiguresModule {}
