import { readFile } from 'node:fs/promises';
import type { OutboxMessageDto } from '@psiform/contracts';

/** Port for the local mail fake's outbox (JSON lines written by scripts/fakes/mail.mjs). */
export abstract class OutboxReader {
  abstract read(file: string): Promise<string>;
}

export class FileOutboxReader extends OutboxReader {
  async read(file: string): Promise<string> {
    try {
      return await readFile(file, 'utf8');
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return ''; // nothing received yet
      throw err;
    }
  }
}

/** Parses the outbox lines (a torn last line, mid-write, is skipped) into newest-first rows. */
export function parseOutbox(content: string): OutboxMessageDto[] {
  const rows: OutboxMessageDto[] = [];
  for (const line of content.split('\n')) {
    if (!line.trim()) continue;
    try {
      const m = JSON.parse(line) as { subject?: string; text?: string; html?: string; to?: string[]; receivedAt?: string };
      rows.push({ subject: m.subject ?? '', text: m.text ?? '', html: m.html ?? '', to: Array.isArray(m.to) ? m.to : [], receivedAt: m.receivedAt ?? '' });
    } catch {
      continue;
    }
  }
  // Stable: equal timestamps keep the later line first.
  return rows.map((r, i) => ({ r, i })).sort((a, b) => (a.r.receivedAt === b.r.receivedAt ? b.i - a.i : a.r.receivedAt < b.r.receivedAt ? 1 : -1)).map(({ r }) => r);
}
