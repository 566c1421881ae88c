import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsModule } from '../assets/assets.module';
import { JobsStore, TypeormJobsStore } from '@psiform/server';
import { JobsService } from './jobs.service';
import { JobsController } from './jobs.controller';

@Module({
  imports: [PublicationsModule, AssetsModule],
  controllers: [JobsController],
  providers: [{ provide: JobsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormJobsStore(ds) }, JobsService],
  exports: [JobsService],
})
export class JobsModule {}
