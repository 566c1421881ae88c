import { DataSource } from 'typeorm';
import { dataSourceOptions } from './schema';

// Arbitrary constant key for pg_advisory_lock: serialises concurrent migrators (api replicas, test files).
const MIGRATION_LOCK_KEY = 7_343_120_001;

/** Runs pending migrations under an advisory lock; returns the names applied. */
export async function runMigrations(url: string): Promise<string[]> {
  const ds = new DataSource(dataSourceOptions(url));
  await ds.initialize();
  const lock = ds.createQueryRunner();
  try {
    await lock.connect();
    await lock.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK_KEY]);
    const applied = await ds.runMigrations({ transaction: 'each' });
    return applied.map((m) => m.name);
  } finally {
    await lock.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK_KEY]).catch(() => undefined);
    await lock.release();
    await ds.destroy();
  }
}
