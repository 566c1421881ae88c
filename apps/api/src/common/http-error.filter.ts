import { ArgumentsHost, BadRequestException, Catch, ConflictException, ForbiddenException, HttpException, Logger, NotFoundException, PayloadTooLargeException, ServiceUnavailableException } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';
import type { Response } from 'express';
import { QueryFailedError } from 'typeorm';
import type { GateBlockedDto } from '@psiform/contracts';
import { DomainError, GateBlockedError, type DomainErrorKind } from '@psiform/server';
import { TooManyRequestsException } from './too-many-requests.exception';

/** The one mapping of domain errors (libs/server common/domain-errors.ts) to HTTP. */
const HTTP: Record<DomainErrorKind, (e: DomainError) => HttpException> = {
  invalid: (e) => new BadRequestException(e.messages), // one message per field, as the ValidationPipe answers
  forbidden: (e) => new ForbiddenException(e.message),
  not_found: (e) => new NotFoundException(e.message),
  conflict: (e) => new ConflictException(e instanceof GateBlockedError ? gateBody(e) : e.message),
  too_large: (e) => new PayloadTooLargeException(e.message),
  unavailable: (e) => new ServiceUnavailableException(e.message),
};

/** A gate's 409 names the gate and each failing check, and says whether a written reason lets the action go ahead. */
function gateBody(e: GateBlockedError): GateBlockedDto {
  return { statusCode: 409, error: 'Conflict', gate: e.gate, message: e.message, failures: e.failures, overridable: e.overridable };
}

export const toHttpException = (e: DomainError): HttpException => HTTP[e.kind](e);

/**
 * The api's one error filter: domain errors (thrown by stores and services) become their HTTP answer; then Nest's own
 * handling and {statusCode, message, error} body, plus: the Retry-After header on 429s; body-parser
 * errors (already translated by common/input/json-body.ts); database refusals of bad values as 4xx naming the column (a safety net behind the
 * DTO and input rules, which should catch these first), logged without the query's parameters (they can hold
 * password hashes); unreachable or stalled dependencies as 503 with the reason.
 */
@Catch()
export class HttpErrorFilter extends BaseExceptionFilter {
  private readonly log = new Logger('HttpErrorFilter');

  catch(exception: unknown, host: ArgumentsHost): void {
    if (exception instanceof DomainError) exception = toHttpException(exception);
    if (exception instanceof TooManyRequestsException && host.getType() === 'http') {
      host.switchToHttp().getResponse<Response>().setHeader('Retry-After', String(exception.retryAfterSeconds));
    }
    super.catch(this.translate(exception), host);
  }

  private translate(exception: unknown): unknown {
    if (exception instanceof HttpException) return exception;
    if (exception instanceof QueryFailedError) {
      const mapped = databaseError(exception.driverError as PgError);
      // Log the code and message only: `query`/`parameters` of a failed INSERT carry what the user sent.
      this.log.warn(`database refused a request: ${(exception.driverError as PgError)?.code ?? '?'} ${exception.message}`);
      if (mapped) return mapped;
      const driver = exception.driverError as { code?: string; message?: string } | undefined;
      const stalled = dependencyError({ code: driver?.code, message: driver?.message, dependency: 'the database' });
      return stalled ?? new ServiceUnavailableException('database: the request could not be completed; try again');
    }
    const unavailable = dependencyError(exception);
    if (unavailable) return unavailable;
    return exception;
  }
}

interface PgError {
  code?: string;
  column?: string;
  constraint?: string;
  table?: string;
}

const camel = (column: string) => column.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase());

/** PostgreSQL error classes 22 (data exception) and 23 (integrity) are the caller's input; 57014 is our timeout. */
export function databaseError(e: PgError | undefined): HttpException | null {
  const field = e?.column ? camel(e.column) : undefined;
  switch (e?.code) {
    case '23502':
      return new BadRequestException(`${field ?? 'a required field'}: must not be null`);
    case '23505':
      return new ConflictException(`${field ?? e.constraint ?? 'record'}: already exists`);
    case '23503':
      return new BadRequestException(`${e.constraint ?? 'reference'}: refers to a record that does not exist`);
    case '23514':
      return new BadRequestException(`${e.constraint ?? 'value'}: outside the allowed values`);
    case '22001':
      return new BadRequestException(`${field ?? 'value'}: too long`);
    case '22003':
      return new BadRequestException(`${field ?? 'number'}: out of range`);
    case '22021':
      return new BadRequestException(`${field ?? 'text'}: must be valid UTF-8 text without NUL characters`);
    case '22P02':
    case '22P05':
    case '22007':
    case '22008':
      return new BadRequestException(`${field ?? 'value'}: not a valid value for this field`);
    case '57014':
      return new ServiceUnavailableException('database: the query took too long; try again shortly');
    default:
      return null;
  }
}

/** Connection failures and timeouts of Redis, S3, SMTP or PostgreSQL: 503 with the reason, not 500. */
export function dependencyError(e: unknown): HttpException | null {
  const err = e as { code?: string; name?: string; message?: string; dependency?: string };
  if (!err || typeof err !== 'object') return null;
  const codes = ['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'EHOSTUNREACH', 'ENOTFOUND', 'EAI_AGAIN'];
  const timeout = err.name === 'DependencyTimeout' || err.name === 'TimeoutError';
  if (timeout || (err.code && codes.includes(err.code)) || /Connection is closed|connection terminated|Command timed out|timeout exceeded when trying to connect|Query read timeout/i.test(err.message ?? '')) {
    return new ServiceUnavailableException(`${err.dependency ?? 'a service this request needs'} is not answering (${err.message}); try again shortly`);
  }
  return null;
}
