import { DeliveryProfilesModule } from '../delivery-profiles/delivery-profiles.module';
import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { FiguresModule } from '../figures/figures.module';
import { JobsModule } from '../jobs/jobs.module';
import { ExportsController } from './exports.controller';
import { ExportsService } from './exports.service';
import { FigureSetsStore, TypeormFigureSetsStore } from '@psiform/server';

@Module({
  imports: [PublicationsModule, FiguresModule, JobsModule, DeliveryProfilesModule],
  controllers: [ExportsController],
  providers: [{ provide: FigureSetsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormFigureSetsStore(ds) }, ExportsService],
})
export class ExportsModule {}
