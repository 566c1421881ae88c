import type { MailNoticeJob } from '@psiform/contracts';
import { Mailer, type OutboxEntity, type OutgoingMail } from '@psiform/server';
import { MailNoticeProcessor } from './mail-notice.processor';
import { NoJobs, NoOutbox, lifecycle } from '../testing/lifecycle';

class FakeMailer extends Mailer {
  sent: OutgoingMail[] = [];
  failNext = 0;
  verify = () => Promise.resolve();
  async send(m: OutgoingMail): Promise<string[]> {
    if (this.failNext-- > 0) throw new Error('connect ECONNREFUSED');
    this.sent.push(m);
    return [m.to].flat();
  }
}

const OUTBOX_ID = '6f1c2a9e-3b4d-4e5f-8a7b-1c2d3e4f5a6b';
const job = (data: unknown, name = 'notice', id = '1') => ({ id, name, data, attemptsMade: 0, opts: {} });
const notice: MailNoticeJob = { to: ['ilse@x.test'], subject: 'Approved: "Figure 1"', text: 't', html: '<p>t</p>' };

describe('MailNoticeProcessor (through the job runner lifecycle)', () => {
  const run = (p: MailNoticeProcessor, j: ReturnType<typeof job>, outbox = new NoOutbox()) => lifecycle(new NoJobs(), outbox).process('psiform-mail', j.name === 'notice' ? p : undefined, j);

  it('sends text and HTML to the recipients and reports who was accepted', async () => {
    const s = new FakeMailer();
    await expect(run(new MailNoticeProcessor(s), job(notice))).resolves.toEqual({ accepted: ['ilse@x.test'] });
    expect(s.sent).toEqual([notice]);
  });

  it('throws on a send failure so BullMQ retries it', async () => {
    const s = new FakeMailer();
    s.failNext = 1;
    const p = new MailNoticeProcessor(s);
    await expect(run(p, job(notice))).rejects.toThrow('ECONNREFUSED');
    await expect(run(p, job(notice))).resolves.toEqual({ accepted: ['ilse@x.test'] });
  });

  it('refuses unknown job names and malformed notices', async () => {
    const p = new MailNoticeProcessor(new FakeMailer());
    await expect(run(p, job(notice, 'other'))).rejects.toThrow('unknown job name "other"');
    await expect(run(p, job({ ...notice, to: [] }))).rejects.toThrow('malformed notice job: to: ');
    await expect(run(p, job({ ...notice, to: ['not an address'] }))).rejects.toThrow('malformed notice job: to.0: must be an e-mail address');
  });

  it('delivers once: a notice whose outbox row is done is not sent again; a sent one marks its row done', async () => {
    const s = new FakeMailer();
    const p = new MailNoticeProcessor(s);
    const outbox = new NoOutbox();
    outbox.findById = async () => ({ id: OUTBOX_ID, state: 'relayed' }) as OutboxEntity;
    await run(p, job(notice, 'notice', OUTBOX_ID), outbox);
    expect(outbox.marks).toEqual([`done:${OUTBOX_ID}`]);
    outbox.findById = async () => ({ id: OUTBOX_ID, state: 'done' }) as OutboxEntity;
    await expect(run(p, job(notice, 'notice', OUTBOX_ID), outbox)).resolves.toEqual({ alreadyDone: true });
    expect(s.sent).toHaveLength(1);
  });

  it('without SMTP_URL the handler is registered but takes no jobs', () => {
    expect(new MailNoticeProcessor(null).enabled).toBe(false);
  });
});
