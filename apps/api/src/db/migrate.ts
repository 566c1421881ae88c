import 'reflect-metadata';
import { loadDatabaseConfig, loadOrExit, runMigrations } from '@psiform/server';

/** `node dist/db/migrate.js`: applies pending migrations to DATABASE_URL, exits 0 on success. */
async function main(): Promise<void> {
  const db = loadOrExit(() => loadDatabaseConfig(process.env));
  const applied = await runMigrations(db.url);
  console.log(applied.length ? `Applied migrations: ${applied.join(', ')}` : 'Database schema is up to date.');
}

main().catch((err: unknown) => {
  console.error(`Migration failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
