import { BadRequestException, ConflictException, ForbiddenException, NotFoundException, PayloadTooLargeException, ServiceUnavailableException } from '@nestjs/common';
import { ConflictError, DuplicateEmailError, ForbiddenError, InvalidInputError, NotFoundError, TooLargeError, TransitionConflict, UnavailableError } from '@psiform/server';
import { toHttpException } from './http-error.filter';

describe('the one mapping of domain errors to HTTP', () => {
  it('answers each kind with its status and the body Nest gives its own exceptions', () => {
    const cases: [Error, { getStatus(): number; getResponse(): unknown }][] = [
      [new InvalidInputError(['title: must be a string', 'recipe.grid.n: must be at least 16']), new BadRequestException(['title: must be a string', 'recipe.grid.n: must be at least 16'])],
      [new ForbiddenError('only the owner may submit'), new ForbiddenException('only the owner may submit')],
      [new NotFoundError('figure x not found'), new NotFoundException('figure x not found')],
      [new ConflictError('figure changed meanwhile'), new ConflictException('figure changed meanwhile')],
      [new TooLargeError('cube: too large'), new PayloadTooLargeException('cube: too large')],
      [new UnavailableError('the database did not answer within 2 s'), new ServiceUnavailableException('the database did not answer within 2 s')],
    ];
    for (const [domain, http] of cases) {
      const mapped = toHttpException(domain as ConflictError);
      expect([mapped.getStatus(), mapped.getResponse()]).toEqual([http.getStatus(), http.getResponse()]);
    }
  });

  it('the stores\' own errors are conflicts (409)', () => {
    expect(toHttpException(new TransitionConflict('cannot submit a figure that is approved')).getStatus()).toBe(409);
    expect(toHttpException(new DuplicateEmailError('a@b.test')).getResponse()).toMatchObject({ statusCode: 409, message: 'email a@b.test is already registered' });
  });
});
