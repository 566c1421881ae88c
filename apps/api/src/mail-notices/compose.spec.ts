import { approvedNotice, changesRequestedNotice, linkMail, submittedNotice } from './compose';

const fig = { title: 'Figure 2.4 <3d_z2> & friends', publicationTitle: 'Shells and Lobes', versionNumber: 3, proofUrl: 'https://figures.example.org/figures/abc/proof' };

describe('mail notices', () => {
  it('name the figure by its title in subject, text and (escaped) HTML', () => {
    for (const m of [submittedNotice(['e@x.test'], fig, 'Ilse'), changesRequestedNotice(['i@x.test'], fig, 'Tomas', 'Lobes too pale'), approvedNotice(['i@x.test'], fig, 'Tomas')]) {
      expect(m.subject).toContain(fig.title);
      expect(m.text).toContain(fig.title);
      expect(m.html).toContain('Figure 2.4 &lt;3d_z2&gt; &amp; friends');
      expect(m.html).not.toContain('<3d_z2>');
    }
  });

  it('every proof notice links straight to the proof, in the text part and as an HTML link', () => {
    for (const m of [submittedNotice(['e@x.test'], fig, 'Ilse'), changesRequestedNotice(['i@x.test'], fig, 'Tomas', 'x'), approvedNotice(['i@x.test'], fig, 'Tomas')]) {
      expect(m.text).toContain(`Open the proof: ${fig.proofUrl}`);
      expect(m.html).toContain(`<a href="${fig.proofUrl}"`);
      expect(m.html.startsWith('<!doctype html>')).toBe(true);
    }
  });

  it('changes requested carries the note; submitted names the version and the submitter', () => {
    expect(changesRequestedNotice(['i@x.test'], fig, 'Tomas', 'Lobes too pale').text).toContain('Lobes too pale');
    const s = submittedNotice(['a@x.test', 'b@x.test'], fig, 'Ilse');
    expect(s.to).toEqual(['a@x.test', 'b@x.test']);
    expect(s.text).toContain('Ilse submitted version 3');
  });

  it('invitation and reset mails carry the link, its lifetime, and escape names in HTML', () => {
    const url = 'https://figures.example.org/set-password#token=abc_DEF-123';
    const inv = linkMail('invite', 'nell@x.test', { displayName: 'Nell <Ash>', invitedBy: 'Ada', url });
    expect(inv.to).toEqual(['nell@x.test']);
    expect(inv.text).toContain(`Choose your password: ${url}`);
    expect(inv.text).toContain('works once and for 3 days');
    expect(inv.text).toContain('Ada has made you an account');
    expect(inv.html).toContain('Nell &lt;Ash&gt;');
    expect(inv.html).toContain(`href="${url}"`);
    const reset = linkMail('reset', 'nell@x.test', { displayName: 'Nell', url });
    expect(reset.subject).toBe('Reset your Psiform password');
    expect(reset.text).toContain('works once and for 2 hours');
  });
});
