import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsModule } from '../assets/assets.module';
import { JobsModule } from '../jobs/jobs.module';
import { FiguresStore, TypeormFiguresStore } from '@psiform/server';
import { FiguresService } from './figures.service';
import { FiguresController } from './figures.controller';

@Module({
  imports: [PublicationsModule, AssetsModule, JobsModule],
  controllers: [FiguresController],
  providers: [{ provide: FiguresStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormFiguresStore(ds) }, FiguresService],
  exports: [FiguresService, FiguresStore],
})
export class FiguresModule {}
