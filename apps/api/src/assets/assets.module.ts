import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { PublicationsModule } from '../publications/publications.module';
import { ObjectStorage, AssetStore, S3AssetStore, TypeormDeliveryProfilesStore } from '@psiform/server';
import { AssetsService } from './assets.service';
import { AssetsController } from './assets.controller';
import { MembershipService } from '../publications/membership.service';
import { AssetNames, TypeormAssetNames } from './asset-names';

@Module({
  imports: [PublicationsModule],
  controllers: [AssetsController],
  providers: [
    { provide: AssetStore, inject: [ObjectStorage, DataSource], useFactory: (s: ObjectStorage, ds: DataSource) => new S3AssetStore(s, ds) },
    { provide: AssetNames, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormAssetNames(ds, new TypeormDeliveryProfilesStore(ds)) },
    { provide: AssetsService, inject: [AssetStore, MembershipService, AssetNames], useFactory: (a: AssetStore, m: MembershipService, n: AssetNames) => new AssetsService(a, m, n) },
  ],
  exports: [AssetStore],
})
export class AssetsModule {}
