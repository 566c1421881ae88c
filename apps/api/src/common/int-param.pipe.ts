import { BadRequestException, ParseIntPipe } from '@nestjs/common';

/** ParseIntPipe whose 400 message names the parameter. */
export const intParam = (name: string, what = 'an integer') => new ParseIntPipe({ exceptionFactory: () => new BadRequestException(`${name} must be ${what}`) });
