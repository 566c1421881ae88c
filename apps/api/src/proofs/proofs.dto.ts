import { Type } from 'class-transformer';
import { IsInt, Max, Min } from 'class-validator';

export class CompareQuery {
  @Type(() => Number)
  // With stopAtFirstError the bottom decorator runs first: the type check, then the range.
  @Min(1, { message: 'from must be at least 1' })
  @Max(1_000_000, { message: 'from must be at most 1000000' })
  @IsInt({ message: 'from must be a version number (an integer)' })
  from: number;

  @Type(() => Number)
  // With stopAtFirstError the bottom decorator runs first: the type check, then the range.
  @Min(1, { message: 'to must be at least 1' })
  @Max(1_000_000, { message: 'to must be at most 1000000' })
  @IsInt({ message: 'to must be a version number (an integer)' })
  to: number;
}
