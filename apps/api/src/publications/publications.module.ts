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
  /** Later features import this module: MembershipService (who sees what, and through ACCESS_RULES who may write what). */
  exports: [MembershipService],
})
export class PublicationsModule {}
