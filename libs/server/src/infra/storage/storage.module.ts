import { Global, Module } from '@nestjs/common';
import { ObjectStorage } from './object-storage';
import { S3ObjectStorage } from './s3-object-storage';
import { StorageHealthProbe } from './storage-health';

@Global()
@Module({
  providers: [{ provide: ObjectStorage, useClass: S3ObjectStorage }, StorageHealthProbe],
  exports: [ObjectStorage, StorageHealthProbe],
})
export class StorageModule {}
