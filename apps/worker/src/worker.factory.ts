import 'reflect-metadata';
import { NestFactory } from '@nestjs/core';
import type { INestApplicationContext, LogLevel } from '@nestjs/common';
import type { WorkerConfig } from '@psiform/server';
import { WorkerModule } from './worker.module';
import { JobRunner } from '@psiform/server';

/** Builds and starts the worker context; main.ts and the e2e test both use it. */
export async function createWorker(config: WorkerConfig, options: { logger?: LogLevel[] | false } = {}): Promise<INestApplicationContext> {
  const app = await NestFactory.createApplicationContext(WorkerModule.forRoot(config), {
    logger: options.logger ?? ['log', 'warn', 'error'],
    abortOnError: false,
  });
  app.enableShutdownHooks();
  await app.init();
  await app.get(JobRunner).waitUntilReady();
  return app;
}
