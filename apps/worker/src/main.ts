import 'reflect-metadata';
import { Logger } from '@nestjs/common';
import { loadOrExit, loadWorkerConfig } from '@psiform/server/config';

/** `node dist/main.js`: validates REDIS_URL / WORKER_CONCURRENCY, then runs the job handlers until SIGTERM. */
async function main(): Promise<void> {
  const config = loadOrExit(() => loadWorkerConfig(process.env));
  // The job handlers (Nest, BullMQ, the engine, sharp) load only after the environment passed, so a misconfigured
  // start fails at once instead of after the whole import.
  const { createWorker } = await import('./worker.factory.js');
  await createWorker(config);
  new Logger('Psiform').log(`worker ${process.pid} ready`);
}

main().catch((err: unknown) => {
  console.error(`Worker failed to start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
