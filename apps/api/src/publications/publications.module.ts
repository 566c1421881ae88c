import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { UsersModule } from '../users/users.module';
import { UserEntity, PublicationEntity, MembershipEntity, PublicationsStore, TypeormPublicationsStore } from '@psiform/server';
import { MembershipService } from './membership.service';
import { AccessPolicy } from './access-policy';
import { PublicationsService } from './publications.service';
import { PublicationsController } from './publications.controller';

@Module({
  imports: [TypeOrmModule.forFeature([PublicationEntity, MembershipEntity, UserEntity]), UsersModule],
  controllers: [PublicationsController],
  providers: [{ provide: PublicationsStore, useClass: TypeormPublicationsStore }, MembershipService, AccessPolicy, PublicationsService],
  /** Later features import this module: MembershipService (who sees what) and AccessPolicy (who may write what). */
  exports: [MembershipService, AccessPolicy],
})
export class PublicationsModule {}
