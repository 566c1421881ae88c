import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { FiguresModule } from '../figures/figures.module';
import { SWATCHBOOKS_ENTITIES, SwatchbooksStore, TypeormSwatchbooksStore } from '@psiform/server';
import { SwatchbooksService } from './swatchbooks.service';
import { RerenderService } from './rerender.service';
import { BatchesController, HouseStyleController, SwatchbooksController } from './swatchbooks.controller';

@Module({
  imports: [TypeOrmModule.forFeature(SWATCHBOOKS_ENTITIES), PublicationsModule, FiguresModule],
  controllers: [SwatchbooksController, HouseStyleController, BatchesController],
  providers: [
    { provide: SwatchbooksStore, useClass: TypeormSwatchbooksStore },
    SwatchbooksService,
    RerenderService,
  ],
  exports: [SwatchbooksService],
})
export class SwatchbooksModule {}
