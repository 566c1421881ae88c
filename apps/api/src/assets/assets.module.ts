import { Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { ASSETS_ENTITIES, AssetStore, S3AssetStore } from '@psiform/server';
import { PublicationsModule } from '../publications/publications.module';
import { AssetsService } from './assets.service';
import { AssetsController } from './assets.controller';
import { MembershipService } from '../publications/membership.service';

@Module({
  imports: [TypeOrmModule.forFeature(ASSETS_ENTITIES), PublicationsModule],
  controllers: [AssetsController],
  providers: [
    { provide: AssetStore, useClass: S3AssetStore },
    { provide: AssetsService, inject: [AssetStore, MembershipService], useFactory: (a: AssetStore, m: MembershipService) => new AssetsService(a, m) },
  ],
  exports: [AssetStore],
})
export class AssetsModule {}
