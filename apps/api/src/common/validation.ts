import { applyDecorators } from '@nestjs/common';
import { IsDefined, ValidateBy, ValidateIf, type ValidationArguments } from 'class-validator';

/**
 * An optional field that, when sent, must not be null. class-validator's @IsOptional() skips every rule for null
 * as well as for a missing field, so `{"title": null}` used to pass validation and reach the database (a 500 on the
 * NOT NULL column). Use this instead of @IsOptional() unless null has a meaning for the field.
 */
export function OptionalNotNull(): PropertyDecorator {
  return applyDecorators(
    ValidateIf((_o: object, v: unknown) => v !== undefined),
    IsDefined({ message: (a: ValidationArguments) => `${a.property} must not be null` }),
  );
}

/** A string of at most `max` bytes in UTF-8 (bcrypt reads only the first 72 bytes of a password, not characters). */
export function MaxUtf8Bytes(max: number): PropertyDecorator {
  return ValidateBy({
    name: 'maxUtf8Bytes',
    validator: {
      validate: (v: unknown) => typeof v !== 'string' || Buffer.byteLength(v, 'utf8') <= max,
      defaultMessage: (a?: ValidationArguments) => `${a?.property} must be at most ${max} bytes in UTF-8`,
    },
  });
}

// Order of the rules on a DTO field: with ValidationPipe's stopAtFirstError, class-validator reports the first failing
// rule in the order the decorators were applied, which is bottom-up. So the type check (@IsString, @IsInt, @IsUUID …)
// goes last, right above the field: a number for a title then reads "title must be a string", not "at most 200
// characters". (@IsDefined, also inside OptionalNotNull, is checked before all others wherever it stands.)
