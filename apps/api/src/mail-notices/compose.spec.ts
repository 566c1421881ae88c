import { approvedNotice, changesRequestedNotice, submittedNotice } from './compose';

const fig = { title: 'Figure 2.4 <3d_z2> & friends', publicationTitle: 'Shells and Lobes', versionNumber: 3 };

describe('mail notices', () => {
  it('name the figure by its title in subject, text and (escaped) HTML', () => {
    for (const m of [submittedNotice(['e@x.test'], fig, 'Ilse'), changesRequestedNotice(['i@x.test'], fig, 'Tomas', 'Lobes too pale'), approvedNotice(['i@x.test'], fig, 'Tomas')]) {
      expect(m.subject).toContain(fig.title);
      expect(m.text).toContain(fig.title);
      expect(m.html).toContain('Figure 2.4 &lt;3d_z2&gt; &amp; friends');
      expect(m.html).not.toContain('<3d_z2>');
    }
  });
  it('changes requested carries the note; submitted names the version and the submitter', () => {
    expect(changesRequestedNotice(['i@x.test'], fig, 'Tomas', 'Lobes too pale').text).toContain('Lobes too pale');
    const s = submittedNotice(['a@x.test', 'b@x.test'], fig, 'Ilse');
    expect(s.to).toEqual(['a@x.test', 'b@x.test']);
    expect(s.text).toContain('Ilse submitted version 3');
  });
});
