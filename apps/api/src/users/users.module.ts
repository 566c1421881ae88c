import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { UserEntity, UserLinkEntity, TypeormUsersStore, UsersStore, PublicationEntity, MembershipEntity, PublicationsStore, TypeormPublicationsStore } from '@psiform/server';
import { UsersService } from './users.service';
import { UsersController } from './users.controller';
import { PasswordLinksService } from './password-links.service';

@Module({
  imports: [TypeOrmModule.forFeature([UserEntity, UserLinkEntity, PublicationEntity, MembershipEntity])],
  controllers: [UsersController],
  providers: [
    UsersService,
    PasswordLinksService,
    { provide: UsersStore, useClass: TypeormUsersStore },
    { provide: PublicationsStore, useClass: TypeormPublicationsStore },
  ],
  exports: [UsersStore, UsersService, PasswordLinksService],
})
export class UsersModule {}
