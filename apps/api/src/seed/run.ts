import 'reflect-metadata';
import { DataSource } from 'typeorm';
import { loadDatabaseConfig, loadOrExit, dataSourceOptions } from '@psiform/server';
import { formatSeedSummary, runSeed } from './seed';

/** `node dist/seed/run.js`: loads the demo scenario into DATABASE_URL (run migrations first). */
async function main(): Promise<void> {
  const db = loadOrExit(() => loadDatabaseConfig(process.env));
  const ds = await new DataSource(dataSourceOptions(db.url)).initialize();
  try {
    console.log(formatSeedSummary(await runSeed(ds)));
  } finally {
    await ds.destroy();
  }
}

main().catch((err: unknown) => {
  console.error(`Seed failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
