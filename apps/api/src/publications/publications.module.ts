import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { UsersModule } from '../users/users.module';
import { UserEntity, PublicationEntity, MembershipEntity, PublicationsStore, TypeormPublicationsStore } from '@psiform/server';
import { MembershipService } from './membership.service';
import { PublicationsService } from './publications.service';
import { PublicationsController } from './publications.controller';

@Module({
  imports: [TypeOrmModule.forFeature([PublicationEntity, MembershipEntity, UserEntity]), UsersModule],
  controllers: [PublicationsController],
  providers: [{ provide: PublicationsStore, useClass: TypeormPublicationsStore }, MembershipService, PublicationsService],
  /** Later features (figures, reviews) import this module and call MembershipService. */
  exports: [MembershipService],
})
export class PublicationsModule {}
