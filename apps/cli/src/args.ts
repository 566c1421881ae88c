import { parseArgs } from 'node:util';
import { UsageError } from './errors';

export type OptionSpec = Record<string, { type: 'string' | 'boolean'; short?: string }>;

/** node:util parseArgs with its errors turned into one short line naming the option. */
export function parseCommandArgs(command: string, argv: string[], options: OptionSpec): Record<string, string | boolean | undefined> {
  try {
    const { values } = parseArgs({ args: argv, options, strict: true, allowPositionals: false, allowNegative: false });
    return values as Record<string, string | boolean | undefined>;
  } catch (err) {
    const e = err as { code?: string; message?: string };
    const msg = String(e.message ?? err);
    const where = command ? `psiform ${command} --help` : 'psiform --help';
    switch (e.code) {
      case 'ERR_PARSE_ARGS_UNKNOWN_OPTION': {
        const opt = /'([^']+)'/.exec(msg)?.[1] ?? '?';
        throw new UsageError(`unknown option '${opt}' (see ${where})`);
      }
      case 'ERR_PARSE_ARGS_UNEXPECTED_POSITIONAL': {
        const arg = /'([^']*)'/.exec(msg)?.[1] ?? '?';
        throw new UsageError(`unexpected argument '${arg}' (see ${where})`);
      }
      case 'ERR_PARSE_ARGS_INVALID_OPTION_VALUE': {
        const opt = /'(--?[A-Za-z0-9-]+)/.exec(msg)?.[1] ?? '?';
        if (/does not take an argument/.test(msg)) throw new UsageError(`option ${opt} does not take a value`);
        if (/ambiguous/.test(msg)) throw new UsageError(`option ${opt} needs a value; write a value that starts with '-' as ${opt}=-VALUE`);
        throw new UsageError(`option ${opt} needs a value`);
      }
      default:
        throw new UsageError(msg.split('\n')[0]);
    }
  }
}
