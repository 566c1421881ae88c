import { Injectable } from '@nestjs/common';
import type { HealthProbe } from '../../health/health.probe';
import { ObjectStorage } from './object-storage';

@Injectable()
export class StorageHealthProbe implements HealthProbe {
  readonly name = 'storage' as const;
  constructor(private readonly storage: ObjectStorage) {}

  check(): Promise<void> {
    return this.storage.check();
  }
}
