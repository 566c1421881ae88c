import { Logger } from '@nestjs/common';
import { ParameterFreeQueryLogger } from './query-logger';

describe('ParameterFreeQueryLogger', () => {
  afterEach(() => jest.restoreAllMocks());

  it('logs a failed insert by its SQL and the database message, never its parameters (a bcrypt hash, an e-mail)', () => {
    const lines: string[] = [];
    jest.spyOn(Logger.prototype, 'error').mockImplementation((m: unknown) => void lines.push(String(m)));
    const hash = '$2b$12$abcdefghijklmnopqrstuuM5vKx0fH8rW2mD3c9YpQeR7sT1uV2wXy';
    new ParameterFreeQueryLogger().logQueryError(
      new Error('duplicate key value violates unique constraint "users_email_key"'),
      'INSERT INTO "users"("email", "display_name", "password_hash")\n  VALUES ($1, $2, $3)',
      ['someone@press.example', 'Some One', hash],
    );
    expect(lines).toHaveLength(1);
    expect(lines[0]).toBe('query failed: INSERT INTO "users"("email", "display_name", "password_hash") VALUES ($1, $2, $3) (duplicate key value violates unique constraint "users_email_key")');
    expect(lines[0]).not.toContain(hash);
    expect(lines[0]).not.toContain('someone@press.example');
  });

  it('stays quiet for ordinary queries and reports warnings', () => {
    const warn = jest.spyOn(Logger.prototype, 'warn').mockImplementation(() => undefined);
    const error = jest.spyOn(Logger.prototype, 'error').mockImplementation(() => undefined);
    const l = new ParameterFreeQueryLogger();
    l.logQuery();
    l.log('info', 'ignored');
    l.log('warn', 'pool is busy');
    expect(error).not.toHaveBeenCalled();
    expect(warn).toHaveBeenCalledWith('pool is busy');
  });
});
