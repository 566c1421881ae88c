import { BadRequestException, Injectable, type ArgumentMetadata, type PipeTransform } from '@nestjs/common';
import { inputProblems } from './input-rules';

/**
 * Global pipe, first in line: every @Body(), @Query() and @Param() value of every route (present and future)
 * meets input-rules.ts before DTO validation, services or the database see it. 400 names each field.
 */
@Injectable()
export class InputSanitationPipe implements PipeTransform {
  transform(value: unknown, meta: ArgumentMetadata): unknown {
    if (meta.type === 'custom') return value;
    if (meta.type === 'body' && !meta.data && value !== undefined && (value === null || typeof value !== 'object' || Array.isArray(value))) {
      throw new BadRequestException('body: must be a JSON object');
    }
    const root = meta.data ?? meta.type; // @Param('id') → "id"; a whole @Body() → "body"
    const problems = inputProblems(value, root);
    if (problems.length) throw new BadRequestException(problems);
    return value;
  }
}
