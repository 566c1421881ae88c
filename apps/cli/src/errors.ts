/** A problem with what the user asked for: printed as one line on stderr, exit code 2, nothing written. */
export class UsageError extends Error {
  constructor(
    message: string,
    readonly exitCode: number = 2,
  ) {
    super(message);
    this.name = 'UsageError';
  }
}

/** Squeezes any message to a single line (library errors may carry newlines). */
export function oneLine(message: string): string {
  return message.replace(/\s*\n\s*/g, '; ').trim();
}
