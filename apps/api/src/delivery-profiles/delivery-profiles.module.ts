import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { FiguresModule } from '../figures/figures.module';
import { DeliveryProfilesStore, PreflightReportsStore, TypeormDeliveryProfilesStore, TypeormPreflightReportsStore } from '@psiform/server';
import { DeliveryProfilesService } from './delivery-profiles.service';
import { DeliveryProfilesController, FigurePreflightController, PressConditionsController } from './delivery-profiles.controller';

@Module({
  imports: [PublicationsModule, FiguresModule],
  controllers: [DeliveryProfilesController, PressConditionsController, FigurePreflightController],
  providers: [
    { provide: DeliveryProfilesStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormDeliveryProfilesStore(ds) },
    { provide: PreflightReportsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormPreflightReportsStore(ds) },
    DeliveryProfilesService,
  ],
  exports: [DeliveryProfilesService],
})
export class DeliveryProfilesModule {}
