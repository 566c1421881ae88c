import { Transform, Type } from 'class-transformer';
import { DESK_STATES, TEXT_LIMITS, textProblem, type DeskState } from '@psiform/contracts';
import { IsDefined, IsNotEmpty, IsNumber, IsObject, IsOptional, IsString, IsUUID, Max, MaxLength, Min, ValidateNested, type ValidationArguments } from 'class-validator';
import { OneOf, OptionalNotNull, stacked, trim } from '../common/validation';


// The limits and their wording are libs/contracts' (TEXT_LIMITS, textProblem), so the client says the same.
export const NOTE_MAX = TEXT_LIMITS.noteMax;
export const COMMENT_MAX = TEXT_LIMITS.commentMax;
const tooLong = (field: string, max: number) => (a: ValidationArguments) => `${field} ${textProblem(a.value, max) ?? `must be at most ${max} characters`}`;

/** A required text field (the note of a change request, a comment's body): trimmed, not empty, at most `max` characters. */
function RequiredText(field: string, max: number): PropertyDecorator {
  return stacked(
    Transform(trim),
    IsDefined({ message: `${field} is required` }),
    IsNotEmpty({ message: `${field} must not be empty` }),
    MaxLength(max, { message: tooLong(field, max) }),
    IsString({ message: `${field} must be a string` }),
  );
}

export class RequestChangesBody {
  @RequiredText('note', NOTE_MAX)
  note: string;
}

export class OptionalNoteBody {
  @OptionalNotNull()
  @Transform(trim)
  @MaxLength(NOTE_MAX, { message: tooLong('note', NOTE_MAX) })
  @IsString({ message: 'note must be a string' })
  note?: string;
}

/** Approve: an optional note, and `override: { reason }` to go past failed preflight (checked by gates/gate.ts). */
export class ApproveBody extends OptionalNoteBody {
  @OptionalNotNull()
  @IsObject({ message: 'override must be an object { reason }' })
  override?: { reason?: unknown };
}

export class PinBody {
  @Min(0, { message: 'x must be a number from 0 to 1' })
  @Max(1, { message: 'x must be a number from 0 to 1' })
  @IsNumber({}, { message: 'x must be a number from 0 to 1' })
  x: number;

  @Min(0, { message: 'y must be a number from 0 to 1' })
  @Max(1, { message: 'y must be a number from 0 to 1' })
  @IsNumber({}, { message: 'y must be a number from 0 to 1' })
  y: number;
}

export class CommentBody {
  @RequiredText('body', COMMENT_MAX)
  body: string;

  @OptionalNotNull()
  @IsUUID('all', { message: 'versionId must be a UUID' })
  versionId?: string;

  @OptionalNotNull()
  @ValidateNested()
  @Type(() => PinBody)
  pin?: PinBody;
}

/** Review desk filters: one publication, a proof state, and how long a proof has waited at least. */
export class ReviewDeskQuery {
  @IsOptional()
  @IsUUID('all', { message: 'publicationId must be a UUID' })
  publicationId?: string;

  @IsOptional()
  @OneOf(DESK_STATES)
  state?: DeskState;

  @IsOptional()
  @Type(() => Number)
  @IsNumber({ allowNaN: false, allowInfinity: false }, { message: 'minAgeHours must be a number of hours' })
  @Min(0, { message: 'minAgeHours must be 0 or more' })
  @Max(100_000, { message: 'minAgeHours must be at most 100000' })
  minAgeHours?: number;
}
