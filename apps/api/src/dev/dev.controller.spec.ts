import { NotFoundException } from '@nestjs/common';
import { type AppConfig } from '@psiform/server';
import { DevController } from './dev.controller';
import { OutboxReader } from './outbox-reader';

class FakeReader extends OutboxReader {
  constructor(private readonly content: string) {
    super();
  }
  async read(): Promise<string> {
    return this.content;
  }
}

const config = (outboxFile?: string) => ({ smtp: { url: 'smtp://127.0.0.1:2525', from: 'x', outboxFile } }) as AppConfig;
const line = JSON.stringify({ id: '1', receivedAt: '2026-01-01T10:00:00.000Z', from: 'a', to: ['e@x.test'], subject: 'Approved: "Figure 1"', text: 'body', html: '<p>body</p>' });

describe('GET /api/dev/outbox', () => {
  it('is 404 when MAIL_OUTBOX_FILE is not set', async () => {
    await expect(new DevController(config(undefined), new FakeReader(line)).list()).rejects.toThrow(NotFoundException);
  });
  it('lists subject, text, recipients and time (no HTML) when it is', async () => {
    await expect(new DevController(config('/tmp/outbox.jsonl'), new FakeReader(line)).list()).resolves.toEqual([
      { subject: 'Approved: "Figure 1"', text: 'body', html: '<p>body</p>', to: ['e@x.test'], receivedAt: '2026-01-01T10:00:00.000Z' },
    ]);
  });
});
