import { Module } from '@nestjs/common';
import { APP_INTERCEPTOR } from '@nestjs/core';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { JobsModule } from '../jobs/jobs.module';
import { SwatchbooksStore, TypeormSwatchbooksStore } from '@psiform/server';
import { SwatchbooksService } from './swatchbooks.service';
import { RerenderService } from './rerender.service';
import { BatchesController, HouseStyleController, SwatchbooksController } from './swatchbooks.controller';
import { HousePaletteInterceptor } from './house-palette.interceptor';

@Module({
  imports: [PublicationsModule, JobsModule],
  controllers: [SwatchbooksController, HouseStyleController, BatchesController],
  providers: [
    { provide: SwatchbooksStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormSwatchbooksStore(ds) },
    SwatchbooksService,
    RerenderService,
    { provide: APP_INTERCEPTOR, useClass: HousePaletteInterceptor },
  ],
  exports: [SwatchbooksService],
})
export class SwatchbooksModule {}
