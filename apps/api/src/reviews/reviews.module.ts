import { Module } from '@nestjs/common';
import { APP_INTERCEPTOR } from '@nestjs/core';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { MailNoticesModule } from '../mail-notices/mail-notices.module';
import { DeliveryProfilesModule } from '../delivery-profiles/delivery-profiles.module';
import { ReviewsStore, TypeormReviewsStore } from '@psiform/server';
import { ReviewsService } from './reviews.service';
import { ReviewDeskController, ReviewsController } from './reviews.controller';
import { FigureEditInterceptor } from './figure-edit.interceptor';

@Module({
  imports: [PublicationsModule, MailNoticesModule, DeliveryProfilesModule],
  controllers: [ReviewsController, ReviewDeskController],
  providers: [
    { provide: ReviewsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormReviewsStore(ds) },
    ReviewsService,
    { provide: APP_INTERCEPTOR, useClass: FigureEditInterceptor },
  ],
  exports: [ReviewsService],
})
export class ReviewsModule {}
