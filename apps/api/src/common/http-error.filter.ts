import { ArgumentsHost, BadRequestException, Catch, ConflictException, ForbiddenException, HttpException, NotFoundException, PayloadTooLargeException, ServiceUnavailableException } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';
import type { Response } from 'express';
import { DomainError, type DomainErrorKind } from '@psiform/server';
import { TooManyRequestsException } from './too-many-requests.exception';

/** The one mapping of domain errors (libs/server common/domain-errors.ts) to HTTP. */
const HTTP: Record<DomainErrorKind, (e: DomainError) => HttpException> = {
  invalid: (e) => new BadRequestException(e.messages), // one message per field, as the ValidationPipe answers
  forbidden: (e) => new ForbiddenException(e.message),
  not_found: (e) => new NotFoundException(e.message),
  conflict: (e) => new ConflictException(e.message),
  too_large: (e) => new PayloadTooLargeException(e.message),
  unavailable: (e) => new ServiceUnavailableException(e.message),
};

export const toHttpException = (e: DomainError): HttpException => HTTP[e.kind](e);

/**
 * The api's one error filter: domain errors become their HTTP answer; then Nest's own handling and
 * {statusCode, message, error} body, plus the Retry-After header on 429s.
 */
@Catch()
export class HttpErrorFilter extends BaseExceptionFilter {
  catch(exception: unknown, host: ArgumentsHost): void {
    if (exception instanceof DomainError) exception = toHttpException(exception);
    if (exception instanceof TooManyRequestsException && host.getType() === 'http') {
      host.switchToHttp().getResponse<Response>().setHeader('Retry-After', String(exception.retryAfterSeconds));
    }
    super.catch(exception, host);
  }
}
