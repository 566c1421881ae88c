import 'reflect-metadata';
import { Logger } from '@nestjs/common';
// The config module alone (no entities, TypeORM or S3 client): see below.
import { loadConfig, loadOrExit } from '@psiform/server/config';

/** `node dist/main.js`: validates the environment, then serves the API on HOST:PORT under /api. */
async function main(): Promise<void> {
  const config = loadOrExit(() => loadConfig(process.env));
  // The application graph (Nest, TypeORM, every feature, the S3 client, sharp) is loaded only after the environment
  // passed: a misconfigured start fails in well under a second instead of after the whole import (several seconds
  // on a busy machine).
  const { createApp } = await import('./app.factory.js');
  const app = await createApp(config);
  await app.listen(config.http.port, config.http.host);
  const port = (app.getHttpServer().address() as { port: number }).port; // actual port when PORT=0
  new Logger('Psiform').log(`API listening on http://${config.http.host}:${port}/api${config.http.webDist ? `, client from ${config.http.webDist}` : ''}`);
}

main().catch((err: unknown) => {
  console.error(`API failed to start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
