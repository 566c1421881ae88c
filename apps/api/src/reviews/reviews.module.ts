import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { DeliveryProfilesModule } from '../delivery-profiles/delivery-profiles.module';
import { REVIEWS_ENTITIES, ReviewsStore, TypeormReviewsStore } from '@psiform/server';
import { ReviewsService } from './reviews.service';
import { ReviewDeskController, ReviewsController } from './reviews.controller';

@Module({
  imports: [TypeOrmModule.forFeature(REVIEWS_ENTITIES), PublicationsModule, DeliveryProfilesModule],
  controllers: [ReviewsController, ReviewDeskController],
  providers: [
    { provide: ReviewsStore, useClass: TypeormReviewsStore },
    ReviewsService,
  ],
  exports: [ReviewsService, ReviewsStore],
})
export class ReviewsModule {}
