import type { IncomingMessage } from 'node:http';
import { BadRequestException, HttpException, PayloadTooLargeException, UnsupportedMediaTypeException } from '@nestjs/common';
import express, { type NextFunction, type Request, type RequestHandler, type Response } from 'express';
import { MAX_INPUT_DEPTH, jsonTextDepth } from './input-rules';

/** Largest JSON body accepted (a recipe is a few kB; a swatchbook file well under this). */
export const JSON_BODY_LIMIT = '1mb';

/** An error body-parser passes on with our status and message (http-errors keeps an error's own status). */
export class BodyRejected extends Error {
  readonly status = 400;
  readonly expose = true;
  readonly type = 'psiform.body.rejected';
}

/**
 * The JSON and urlencoded parsers for every route, replacing Nest's default ones so the nesting depth is checked
 * on the raw text before JSON.parse or any recursive validator sees the document.
 */
export function bodyParsers(): RequestHandler[] {
  const verify = (_req: IncomingMessage, _res: unknown, buf: Buffer) => {
    if (jsonTextDepth(buf.toString('utf8'), MAX_INPUT_DEPTH) > MAX_INPUT_DEPTH) throw new BodyRejected(`body: nested deeper than ${MAX_INPUT_DEPTH} levels`);
  };
  return [
    express.json({ limit: JSON_BODY_LIMIT, verify }),
    // qs stops at depth 5 by itself (the rest stays a string key).
    express.urlencoded({ extended: true, limit: JSON_BODY_LIMIT }),
  ].map(translated);
}

/** Passes body-parser's errors on as HttpExceptions whose message names the body (Nest would pass bare text). */
function translated(parser: RequestHandler): RequestHandler {
  return (req: Request, res: Response, next: NextFunction) => parser(req, res, (err?: unknown) => next(err === undefined ? undefined : bodyParserError(err)));
}

/** body-parser's http-errors (malformed JSON, too large, bad charset, our depth check) as 4xx naming the body. */
export function bodyParserError(e: unknown): unknown {
  const err = e as { type?: string; status?: number; message?: string; limit?: number };
  if (!err || typeof err.type !== 'string' || typeof err.status !== 'number') return e;
  switch (err.type) {
    case 'psiform.body.rejected':
      return new BadRequestException(err.message);
    case 'entity.parse.failed':
      return new BadRequestException(`body: not valid JSON (${err.message})`);
    case 'entity.too.large':
      return new PayloadTooLargeException(`body: larger than the limit of ${err.limit} bytes`);
    case 'charset.unsupported':
    case 'encoding.unsupported':
      return new UnsupportedMediaTypeException(`body: ${err.message}`);
    case 'request.aborted':
    case 'request.size.invalid':
    case 'stream.encoding.set':
    case 'stream.not.readable':
      return new BadRequestException(`body: ${err.message}`);
    default:
      return err.status >= 400 && err.status < 500 ? new HttpException(`body: ${err.message}`, err.status) : e;
  }
}


