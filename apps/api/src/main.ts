import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { loadConfig, loadOrExit } from '@psiform/server';
import { createApp } from './app.factory';

/** `node dist/main.js`: validates the environment, then serves the API on HOST:PORT under /api. */
async function main(): Promise<void> {
  const config = loadOrExit(() => loadConfig(process.env));
  const app = await createApp(config);
  await app.listen(config.http.port, config.http.host);
  const port = (app.getHttpServer().address() as { port: number }).port; // actual port when PORT=0
  new Logger('Psiform').log(`API listening on http://${config.http.host}:${port}/api${config.http.webDist ? `, client from ${config.http.webDist}` : ''}`);
}

main().catch((err: unknown) => {
  console.error(`API failed to start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
