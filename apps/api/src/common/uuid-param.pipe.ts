import { BadRequestException, ParseUUIDPipe } from '@nestjs/common';

/** ParseUUIDPipe whose 400 message names the parameter. */
export const uuidParam = (name: string) => new ParseUUIDPipe({ exceptionFactory: () => new BadRequestException(`${name} must be a UUID`) });
