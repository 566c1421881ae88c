import 'reflect-metadata';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { ValidationPipe, type LogLevel } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import type { NextFunction, Request, Response } from 'express';
import { type AppConfig } from '@psiform/server';
import { AppModule } from './app.module';
import { serveOpenApi } from './docs/openapi';

// eslint-disable-next-line @typescript-eslint/no-require-imports -- the package version, read at run time outside rootDir
const API_VERSION = (require('../package.json') as { version: string }).version;
import { bodyParsers } from './common/input/json-body';
import { InputSanitationPipe } from './common/input/input-sanitation.pipe';
import { noStoreForApi, securityHeaders } from './common/security-headers';

export const API_PREFIX = 'api';

export interface CreateAppOptions {
  logger?: LogLevel[] | false;
}

/** Builds the configured (not yet listening) app; main.ts and the e2e tests both use it. */
export async function createApp(config: AppConfig, options: CreateAppOptions = {}): Promise<NestExpressApplication> {
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config), {
    logger: options.logger ?? ['log', 'warn', 'error'],
    abortOnError: false,
    bodyParser: false, // ours (common/input/json-body.ts) checks the nesting depth before parsing
  });
  if (config.http.trustProxy !== false) app.set('trust proxy', config.http.trustProxy);
  app.use(securityHeaders([new URL(config.s3.endpoint).origin]));
  app.use(noStoreForApi(API_PREFIX));
  for (const parser of bodyParsers()) app.use(parser);
  app.setGlobalPrefix(API_PREFIX);
  // Input rules first (NUL, lone surrogates, depth, prototype keys in body, query and params), then the DTOs.
  app.useGlobalPipes(
    new InputSanitationPipe(),
    new ValidationPipe({ whitelist: true, forbidNonWhitelisted: true, transform: true, stopAtFirstError: true, validationError: { target: false, value: false } }),
  );
  app.disable('x-powered-by');
  app.enableShutdownHooks();
  serveOpenApi(app, API_VERSION); // /api/docs and /api/docs-json
  if (config.http.webDist) serveWebDist(app, config.http.webDist);
  return app;
}

/** Static client at "/" with an SPA fallback to index.html for GET routes outside /api. */
function serveWebDist(app: NestExpressApplication, dir: string): void {
  const root = resolve(dir);
  const index = join(root, 'index.html');
  if (!existsSync(index)) throw new Error(`WEB_DIST ${root} has no index.html`);
  app.useStaticAssets(root, { index: false, fallthrough: true });
  app.use((req: Request, res: Response, next: NextFunction) => {
    const isApi = req.path === `/${API_PREFIX}` || req.path.startsWith(`/${API_PREFIX}/`);
    if ((req.method !== 'GET' && req.method !== 'HEAD') || isApi) return next();
    res.sendFile(index);
  });
}
