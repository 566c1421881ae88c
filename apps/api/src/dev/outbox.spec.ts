import { parseOutbox } from './outbox-reader';

describe('parseOutbox', () => {
  it('returns newest first and skips a torn line', () => {
    const lines = [
      JSON.stringify({ id: '1', receivedAt: '2026-01-01T10:00:00.000Z', from: 'a', to: ['x@t'], subject: 'first', text: 'one', html: '' }),
      JSON.stringify({ id: '2', receivedAt: '2026-01-01T11:00:00.000Z', from: 'a', to: ['y@t'], subject: 'second', text: 'two', html: '' }),
      '{"id": "3", "recei',
    ].join('\n');
    expect(parseOutbox(lines)).toEqual([
      { subject: 'second', text: 'two', html: '', to: ['y@t'], receivedAt: '2026-01-01T11:00:00.000Z' },
      { subject: 'first', text: 'one', html: '', to: ['x@t'], receivedAt: '2026-01-01T10:00:00.000Z' },
    ]);
    expect(parseOutbox('')).toEqual([]);
  });
});
