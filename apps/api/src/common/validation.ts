import { applyDecorators } from '@nestjs/common';
import { Transform, Type } from 'class-transformer';
import { IsDefined, IsIn, IsInt, IsNotEmpty, IsOptional, IsString, Max, MaxLength, Min, ValidateBy, ValidateIf, type ValidationArguments } from 'class-validator';
import { ADMIN_PAGE_SIZE } from '@psiform/contracts';

// The field rules that more than one DTO uses live here, once, with their wording: a feature's dto.ts names its own
// fields and uses these for the shared ones (paging, search, sort order, a value from a fixed list, trimming).

/** class-transformer @Transform: a string without its surrounding white space (other values pass as they are). */
export const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

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

/**
 * Composes rules written top to bottom as they would stand on a field. TypeScript applies a field's decorators
 * bottom-up and applyDecorators applies its list in order, so the list is reversed: the order the rules are checked
 * in (see above) stays what it reads as.
 */
export function stacked(...decorators: PropertyDecorator[]): PropertyDecorator {
  return applyDecorators(...decorators.reverse());
}

/** A value from a fixed list, in one wording for every DTO: "<field> must be one of: a, b, c". */
export function OneOf(values: readonly string[]): PropertyDecorator {
  return IsIn(values as readonly string[], { message: (a: ValidationArguments) => `${a.property} must be one of: ${values.join(', ')}` });
}

/** `order` of a sorted list: asc or desc. `optional` is IsOptional() for the admin lists (null = absent). */
export function SortOrder(optional: PropertyDecorator = IsOptional()): PropertyDecorator {
  return stacked(optional, IsIn(['asc', 'desc'], { message: 'order must be asc or desc' }));
}

/** `page` of an admin list (people, publications, audit): 1..100000. */
export function AdminPage(): PropertyDecorator {
  return stacked(
    IsOptional(),
    Type(() => Number),
    IsInt({ message: 'page must be an integer' }),
    Min(1, { message: 'page must be 1..100000' }),
    Max(100_000, { message: 'page must be 1..100000' }),
  );
}

/** `pageSize` of an admin list: 1..ADMIN_PAGE_SIZE.max (libs/contracts, so the client pages alike). */
export function AdminPageSize(): PropertyDecorator {
  return stacked(
    IsOptional(),
    Type(() => Number),
    IsInt({ message: 'pageSize must be an integer' }),
    Min(1, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` }),
    Max(ADMIN_PAGE_SIZE.max, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` }),
  );
}

/** `q`, an admin list's search text: trimmed, at most 200 characters. */
export function AdminSearch(): PropertyDecorator {
  return stacked(IsOptional(), Transform(trim), IsString({ message: 'q must be a string' }), MaxLength(200, { message: 'q must be at most 200 characters' }));
}

/**
 * A name-like text field (a title, a publisher, a display name): trimmed, not empty, at most `max` characters, its
 * messages naming the field. Required as it stands; put OptionalNotNull() above it for a PATCH body.
 */
export function TrimmedText(max: number): PropertyDecorator {
  return stacked(
    Transform(trim),
    IsNotEmpty({ message: (a: ValidationArguments) => `${a.property} must not be empty` }),
    MaxLength(max, { message: (a: ValidationArguments) => `${a.property} must be at most ${max} characters` }),
    IsString({ message: (a: ValidationArguments) => `${a.property} must be a string` }),
  );
}

/** The paging and search every admin list takes (people, publications); a list's own filters extend it. */
export class AdminListQuery {
  @AdminPage()
  page?: number;

  @AdminPageSize()
  pageSize?: number;

  @AdminSearch()
  q?: string;
}
