import { DeliveryProfilesModule } from '../delivery-profiles/delivery-profiles.module';
import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { FiguresModule } from '../figures/figures.module';
import { JobsModule } from '../jobs/jobs.module';
import { ExportsController } from './exports.controller';
import { ExportsService } from './exports.service';
import { FIGURE_SETS_ENTITIES, FigureSetsStore, TypeormFigureSetsStore } from '@psiform/server';

@Module({
  imports: [TypeOrmModule.forFeature(FIGURE_SETS_ENTITIES), PublicationsModule, FiguresModule, JobsModule, DeliveryProfilesModule],
  controllers: [ExportsController],
  providers: [{ provide: FigureSetsStore, useClass: TypeormFigureSetsStore }, ExportsService],
})
export class ExportsModule {}
