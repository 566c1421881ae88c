import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { UserEntity, TypeormUsersStore, UsersStore } from '@psiform/server';
import { UsersService } from './users.service';
import { UsersController } from './users.controller';

@Module({
  imports: [TypeOrmModule.forFeature([UserEntity])],
  controllers: [UsersController],
  providers: [UsersService, { provide: UsersStore, useClass: TypeormUsersStore }],
  exports: [UsersStore, UsersService],
})
export class UsersModule {}
