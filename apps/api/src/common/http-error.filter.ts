import { ArgumentsHost, Catch } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';
import type { Response } from 'express';
import { TooManyRequestsException } from './too-many-requests.exception';

/** Nest's own error handling and {statusCode, message, error} body, plus the Retry-After header on 429s. */
@Catch()
export class HttpErrorFilter extends BaseExceptionFilter {
  catch(exception: unknown, host: ArgumentsHost): void {
    if (exception instanceof TooManyRequestsException && host.getType() === 'http') {
      host.switchToHttp().getResponse<Response>().setHeader('Retry-After', String(exception.retryAfterSeconds));
    }
    super.catch(exception, host);
  }
}
