import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { ObjectStorage, AssetStore, S3AssetStore } from '@psiform/server';
import { AssetsService } from './assets.service';
import { AssetsController } from './assets.controller';
import { MembershipService } from '../publications/membership.service';

@Module({
  imports: [PublicationsModule],
  controllers: [AssetsController],
  providers: [
    { provide: AssetStore, inject: [ObjectStorage, DataSource], useFactory: (s: ObjectStorage, ds: DataSource) => new S3AssetStore(s, ds) },
    { provide: AssetsService, inject: [AssetStore, MembershipService], useFactory: (a: AssetStore, m: MembershipService) => new AssetsService(a, m) },
  ],
  exports: [AssetStore],
})
export class AssetsModule {}
