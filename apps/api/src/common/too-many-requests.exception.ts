import { HttpException, HttpStatus } from '@nestjs/common';

/** 429 carrying the Retry-After seconds; HttpErrorFilter turns it into the header. */
export class TooManyRequestsException extends HttpException {
  constructor(
    message: string,
    readonly retryAfterSeconds: number,
  ) {
    super({ statusCode: HttpStatus.TOO_MANY_REQUESTS, message, error: 'Too Many Requests' }, HttpStatus.TOO_MANY_REQUESTS);
  }
}
