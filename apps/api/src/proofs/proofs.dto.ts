import { Type } from 'class-transformer';
import { IsInt, Max, Min } from 'class-validator';

export class CompareQuery {
  @Type(() => Number)
  @IsInt({ message: 'from must be a version number (an integer)' })
  @Min(1, { message: 'from must be at least 1' })
  @Max(1_000_000, { message: 'from must be at most 1000000' })
  from: number;

  @Type(() => Number)
  @IsInt({ message: 'to must be a version number (an integer)' })
  @Min(1, { message: 'to must be at least 1' })
  @Max(1_000_000, { message: 'to must be at most 1000000' })
  to: number;
}
