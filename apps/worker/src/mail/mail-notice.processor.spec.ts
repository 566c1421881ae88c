import type { MailNoticeJob } from '@psiform/contracts';
import { MailNoticeProcessor } from './mail-notice.processor';
import { MailSender } from './mail-sender';

class FakeSender extends MailSender {
  sent: MailNoticeJob[] = [];
  failNext = 0;
  async send(m: MailNoticeJob): Promise<string[]> {
    if (this.failNext-- > 0) throw new Error('connect ECONNREFUSED');
    this.sent.push(m);
    return m.to;
  }
}

const job = (data: unknown, name = 'notice') => ({ id: '1', name, data: data as MailNoticeJob, attemptsMade: 0, opts: {} });
const notice: MailNoticeJob = { to: ['ilse@x.test'], subject: 'Approved: "Figure 1"', text: 't', html: '<p>t</p>' };

describe('MailNoticeProcessor', () => {
  it('sends text and HTML to the recipients and reports who was accepted', async () => {
    const s = new FakeSender();
    await expect(new MailNoticeProcessor(s).process(job(notice))).resolves.toEqual({ accepted: ['ilse@x.test'] });
    expect(s.sent).toEqual([notice]);
  });

  it('throws on a send failure so BullMQ retries it', async () => {
    const s = new FakeSender();
    s.failNext = 1;
    const p = new MailNoticeProcessor(s);
    await expect(p.process(job(notice))).rejects.toThrow('ECONNREFUSED');
    await expect(p.process(job(notice))).resolves.toEqual({ accepted: ['ilse@x.test'] });
  });

  it('refuses unknown job names and malformed notices', async () => {
    const p = new MailNoticeProcessor(new FakeSender());
    await expect(p.process(job(notice, 'other'))).rejects.toThrow('unknown job name "other"');
    await expect(p.process(job({ ...notice, to: [] }))).rejects.toThrow('malformed mail notice');
  });
});
