import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { JOBS_ENTITIES, JobsStore, TypeormJobsStore } from '@psiform/server';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsModule } from '../assets/assets.module';
import { JobsService } from './jobs.service';
import { JobsController } from './jobs.controller';

@Module({
  imports: [TypeOrmModule.forFeature(JOBS_ENTITIES), PublicationsModule, AssetsModule],
  controllers: [JobsController],
  providers: [{ provide: JobsStore, useClass: TypeormJobsStore }, JobsService],
  exports: [JobsService],
})
export class JobsModule {}
