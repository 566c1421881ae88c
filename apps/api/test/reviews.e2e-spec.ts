import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Queue } from 'bullmq';
import Redis from 'ioredis';
import { QUEUES, type AuditEntryDto, type ReviewTransitionDto } from '@psiform/contracts';
import { auth, demoTokens, smallRecipe, startTestApp, RUN_ID, type TestApp, newAccount } from './support';
import { MailFake, freePort } from './editorial-support';
import { startWorkerProcess, waitFor, type WorkerProcess } from './worker-process';

/**
 * Editorial review end to end: api in-process, the compiled worker as a child process sending notices to our
 * own instance of the SMTP fake, real PostgreSQL and Redis. Everything happens in a publication of this run.
 */
describe('editorial review (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let outsider: string;
  let otherIllustrator: string;
  let pubId: string;
  let pubTitle: string;
  let worker: WorkerProcess | undefined;
  let fake: MailFake;
  let dir: string;
  const emails: Record<string, string> = {};
  const cleanupSwatchbooks: string[] = [];

  const createFigure = async (title: string, recipe = smallRecipe()) =>
    (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pubId, title: `${title} ${RUN_ID}`, recipe }).expect(201)).body;
  const post = (path: string, token: string, body: object = {}) => t.http().post(path).set(auth(token)).send(body);
  const mailsFor = (title: string) => fake.messages().filter((m) => m.subject.includes(title));

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'psiform-review-e2e-'));
    fake = new MailFake(await freePort(), join(dir, 'outbox.jsonl'));
    await fake.start();
    t = await startTestApp({ MAIL_OUTBOX_FILE: fake.outbox });
    tok = await demoTokens(t);
    for (const [k, token] of Object.entries(tok)) {
      const me = (await t.http().get('/api/auth/me').set(auth(token)).expect(200)).body;
      emails[k] = me.email;
      emails[`${k}Id`] = me.id;
    }
    pubTitle = `Orbitals in Colour, 2nd ed. ${RUN_ID}`;
    pubId = (await post('/api/publications', tok.admin, { title: pubTitle, publisher: 'Fenwick Lane Books', kind: 'book' }).expect(201)).body.id;
    for (const k of ['illustrator', 'editor', 'artDirector']) await post(`/api/publications/${pubId}/members`, tok.admin, { userId: emails[`${k}Id`] }).expect(201);
    outsider = (await newAccount(t, tok.admin, { name: 'review-outsider', displayName: 'Outside Editor', role: 'editor' })).token;
    otherIllustrator = (await newAccount(t, tok.admin, { name: 'second-illustrator', displayName: 'Second Illustrator', role: 'illustrator', memberOf: pubId })).token;
    worker = await startWorkerProcess({ SMTP_URL: fake.url });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    if (t) {
      await t.ds.query(`DELETE FROM house_styles WHERE publication_id = $1`, [pubId]);
      if (cleanupSwatchbooks.length) await t.ds.query(`DELETE FROM swatchbooks WHERE id = ANY($1)`, [cleanupSwatchbooks]);
      await t.close();
    }
    await fake?.stop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }, 30000);

  it('submit, request changes, revise, submit again, approve, release: roles, membership and states checked at every step', async () => {
    const title = `Figure 3.2 The 2p_z lobes`;
    const fig = await createFigure(title);
    const id = fig.id as string;
    const v1 = fig.currentVersion;
    expect(fig.status).toBe('draft');

    // submit: the owner (or an admin) only
    await post(`/api/figures/${id}/submit`, tok.editor).expect(403);
    await post(`/api/figures/${id}/submit`, otherIllustrator).expect(403);
    await post(`/api/figures/${id}/approve`, tok.illustrator).expect(403);
    await post(`/api/figures/${id}/approve`, tok.editor).expect(409);
    const submitted: ReviewTransitionDto = (await post(`/api/figures/${id}/submit`, tok.illustrator).expect(200)).body;
    expect(submitted).toMatchObject({ figureId: id, action: 'submit', fromStatus: 'draft', status: 'in_review', versionNumber: 1, missing: [] });

    // the submitted version is now a proof: locked, and the figure cannot be edited while in review
    const inReview = (await t.http().get(`/api/figures/${id}`).set(auth(tok.editor)).expect(200)).body;
    expect(inReview.status).toBe('in_review');
    expect(inReview.currentVersion).toMatchObject({ id: v1.id, number: 1, locked: true });
    const again = await post(`/api/figures/${id}/submit`, tok.illustrator).expect(409);
    expect(again.body.message).toBe('cannot submit a figure that is in_review: allowed only from draft or changes_requested');
    const editWhileReview = await t.http().patch(`/api/figures/${id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 40 } }) }).expect(409);
    expect(editWhileReview.body.message).toContain('in_review');

    // the review desk of the publication's editor lists it, with age and publication title; not an outsider's
    const desk = (await t.http().get('/api/review-desk').set(auth(tok.editor)).expect(200)).body as { figureId: string; ageHours: number; publicationTitle: string; versionNumber: number }[];
    const item = desk.find((d) => d.figureId === id)!;
    expect(item).toMatchObject({ publicationTitle: pubTitle, versionNumber: 1 });
    expect(item.ageHours).toBeGreaterThanOrEqual(0);
    expect(item.ageHours).toBeLessThan(1);
    expect(((await t.http().get('/api/review-desk').set(auth(outsider)).expect(200)).body as { figureId: string }[]).map((d) => d.figureId)).not.toContain(id);
    await t.http().get('/api/review-desk').set(auth(tok.illustrator)).expect(403);

    // request changes: editors who are members, with a note
    await post(`/api/figures/${id}/request-changes`, outsider, { note: 'x' }).expect(404);
    await post(`/api/figures/${id}/request-changes`, tok.artDirector, { note: 'x' }).expect(403);
    const noNote = await post(`/api/figures/${id}/request-changes`, tok.editor, {}).expect(400);
    expect(noNote.body.message).toEqual(expect.arrayContaining(['note is required']));
    const long = await post(`/api/figures/${id}/request-changes`, tok.editor, { note: 'n'.repeat(2001) }).expect(400);
    expect(long.body.message).toEqual(['note must be at most 2000 characters (this one has 2001)']); // contracts textProblem, as the client shows it
    const note = 'The nodal plane should read clearly: enlarge the grid and lighten the negative lobe.';
    const changes = (await post(`/api/figures/${id}/request-changes`, tok.editor, { note }).expect(200)).body;
    expect(changes).toMatchObject({ fromStatus: 'in_review', status: 'changes_requested' });

    // a pinned comment on the proof
    const c = await post(`/api/figures/${id}/comments`, tok.editor, { body: 'Lobe edge looks jagged here.', versionId: v1.id, pin: { x: 0.25, y: 0.7 } }).expect(201);
    expect(c.body).toMatchObject({ figureId: id, versionId: v1.id, pin: { x: 0.25, y: 0.7 }, body: 'Lobe edge looks jagged here.' });
    const badPin = await post(`/api/figures/${id}/comments`, tok.editor, { body: 'x', pin: { x: 2, y: 0.5 } }).expect(400);
    expect(badPin.body.message).toEqual(['pin.x must be a number from 0 to 1']);
    await post(`/api/figures/${id}/comments`, outsider, { body: 'x' }).expect(404);
    const comments = (await t.http().get(`/api/figures/${id}/comments`).set(auth(tok.illustrator)).expect(200)).body;
    expect(comments).toHaveLength(1);

    // revise: a PATCH makes version 2 (draft); version 1 stays as it was, locked
    const revised = (await t.http().patch(`/api/figures/${id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 40 } }) }).expect(200)).body;
    expect(revised.status).toBe('draft');
    expect(revised.currentVersion).toMatchObject({ number: 2, locked: false });
    const [row] = await t.ds.query(`SELECT locked, recipe_hash FROM figure_versions WHERE id = $1`, [v1.id]);
    expect(row.locked).toBe(true);
    expect((await t.ds.query(`SELECT recipe->'grid'->>'n' AS n FROM figure_versions WHERE id = $1`, [v1.id]))[0].n).toBe('32');

    // submit again, approve (the editor), then nothing edits it
    await post(`/api/figures/${id}/submit`, tok.illustrator).expect(200);
    await post(`/api/figures/${id}/approve`, outsider).expect(404);
    await post(`/api/figures/${id}/approve`, tok.illustrator).expect(403);
    const approved = (await post(`/api/figures/${id}/approve`, tok.editor, { note: 'Clear and printable.' }).expect(200)).body;
    expect(approved).toMatchObject({ fromStatus: 'in_review', status: 'approved', versionNumber: 2, missing: [] });
    const patchAfter = await t.http().patch(`/api/figures/${id}`).set(auth(tok.illustrator)).send({ title: `Renamed ${RUN_ID}` }).expect(409);
    expect(patchAfter.body.message).toBe('cannot edit a figure that is approved: allowed only from draft or changes_requested');
    await post(`/api/figures/${id}/request-changes`, tok.editor, { note: 'late' }).expect(409);

    // release: editor or admin
    await post(`/api/figures/${id}/release`, tok.illustrator).expect(403);
    expect((await post(`/api/figures/${id}/release`, tok.editor).expect(200)).body).toMatchObject({ fromStatus: 'approved', status: 'released' });

    // the audit log, in order: who, from, to, note
    await t.http().get(`/api/figures/${id}/audit`).set(auth(outsider)).expect(404);
    const audit = (await t.http().get(`/api/figures/${id}/audit`).set(auth(tok.illustrator)).expect(200)).body as AuditEntryDto[];
    expect(audit.map((e) => [e.action, e.fromStatus, e.toStatus])).toEqual([
      ['submit', 'draft', 'in_review'],
      ['request_changes', 'in_review', 'changes_requested'],
      ['comment', 'changes_requested', 'changes_requested'],
      ['revise', 'changes_requested', 'draft'],
      ['submit', 'draft', 'in_review'],
      ['approve', 'in_review', 'approved'],
      ['release', 'approved', 'released'],
    ]);
    expect(audit[1]).toMatchObject({ actorId: emails.editorId, actorName: 'Tomas Edevane', note });
    expect(audit[0].actorId).toBe(emails.illustratorId);
    expect(audit[5].note).toBe('Clear and printable.');
    const times = audit.map((e) => Date.parse(e.at));
    expect([...times].sort((a, b) => a - b)).toEqual(times);

    // notices: submit (twice) to the publication's editor, changes requested and approval to the owner
    const mails = await waitFor('four notices naming the figure', async () => {
      const m = mailsFor(title);
      return m.length >= 4 ? m : undefined;
    }, 30000, 200);
    const toEditor = mails.filter((m) => m.to.includes(emails.editor));
    const toOwner = mails.filter((m) => m.to.includes(emails.illustrator));
    expect(toEditor.map((m) => m.subject)).toEqual([`Proof ready for review: "${title} ${RUN_ID}"`, `Proof ready for review: "${title} ${RUN_ID}"`]);
    expect(toOwner.map((m) => m.subject).sort()).toEqual([`Approved: "${title} ${RUN_ID}"`, `Changes requested on "${title} ${RUN_ID}"`]);
    const changesMail = toOwner.find((m) => m.subject.startsWith('Changes'))!;
    expect(changesMail.text).toContain(note);
    expect(changesMail.html).toMatch(/<p[\s>]/);
    expect(changesMail.text).toMatch(/Open the proof: https?:\/\/\S+\/figures\/[0-9a-f-]{36}\/proof/);
    expect(changesMail.html).toContain(`${title} ${RUN_ID}`);
    expect(mails.every((m) => !m.to.includes(emails.artDirector))).toBe(true);

    // the dev outbox (admin only) shows them, newest first
    await t.http().get('/api/dev/outbox').set(auth(tok.editor)).expect(403);
    const outbox = (await t.http().get('/api/dev/outbox').set(auth(tok.admin)).expect(200)).body as { subject: string; receivedAt: string; to: string[]; text: string }[];
    const ours = outbox.filter((m) => m.subject.includes(title));
    expect(ours.length).toBeGreaterThanOrEqual(4);
    const received = outbox.map((m) => m.receivedAt);
    expect([...received].sort().reverse()).toEqual(received);
  }, 90000);

  it('where the house style requires colour sign-off, approval needs the editor AND an art director', async () => {
    const sb = (await post('/api/swatchbooks', tok.artDirector, { name: `Review house ${RUN_ID}`, publicationId: pubId, colors: { positive: '#b8432f', negative: '#2c5f8a', background: '#fbfaf7', label: '#1b1b1b' } }).expect(201)).body;
    cleanupSwatchbooks.push(sb.id);
    await t.http().put(`/api/publications/${pubId}/house-style`).set(auth(tok.editor)).send({ swatchbookId: sb.id, requireColourSignOff: true }).expect(403);
    await t.http().put(`/api/publications/${pubId}/house-style`).set(auth(tok.artDirector)).send({ swatchbookId: sb.id, requireColourSignOff: true }).expect(200);
    const house = (await t.http().get(`/api/publications/${pubId}/house-style`).set(auth(tok.illustrator)).expect(200)).body;
    expect(house).toMatchObject({ swatchbookId: sb.id, requireColourSignOff: true, allowOverride: false });

    // the pinned swatchbook's colours replace whatever the recipe asked for
    const fig = await createFigure('Figure 4.1 3d_z2 with its torus', smallRecipe({ palette: { positive: '#00ff00', negative: '#ff00ff' } }));
    expect(fig.currentVersion.recipe.palette).toEqual({ swatchbookId: sb.id, positive: '#b8432f', negative: '#2c5f8a' });
    expect(fig.currentVersion.recipe.stage.background.color).toBe('#fbfaf7');

    await post(`/api/figures/${fig.id}/submit`, tok.illustrator).expect(200);
    await post(`/api/figures/${fig.id}/colour-signoff`, tok.editor).expect(403);
    const first = (await post(`/api/figures/${fig.id}/approve`, tok.editor).expect(200)).body;
    expect(first).toMatchObject({ status: 'in_review', missing: ['colour_signoff'] });
    expect(first.message).toContain("art director's colour sign-off");
    const desk = (await t.http().get('/api/review-desk').set(auth(tok.artDirector)).expect(200)).body as { figureId: string; editorApproved: boolean; colourSignedOff: boolean; requireColourSignOff: boolean }[];
    expect(desk.find((d) => d.figureId === fig.id)).toMatchObject({ editorApproved: true, colourSignedOff: false, requireColourSignOff: true });
    await post(`/api/figures/${fig.id}/approve`, tok.editor).expect(409);
    const done = (await post(`/api/figures/${fig.id}/colour-signoff`, tok.artDirector, { note: 'Phases match the house swatchbook.' }).expect(200)).body;
    expect(done).toMatchObject({ status: 'approved', missing: [] });
    const audit = (await t.http().get(`/api/figures/${fig.id}/audit`).set(auth(tok.editor)).expect(200)).body as AuditEntryDto[];
    expect(audit.map((e) => [e.action, e.toStatus])).toEqual([
      ['submit', 'in_review'],
      ['approve', 'in_review'],
      ['colour_signoff', 'approved'],
    ]);
    await t.http().put(`/api/publications/${pubId}/house-style`).set(auth(tok.artDirector)).send({ swatchbookId: sb.id, requireColourSignOff: false, allowOverride: true }).expect(200);
  }, 60000);

  it('a mail fake stopped for a moment loses no notice (retries with a capped backoff) and it is delivered once', async () => {
    const title = 'Figure 5.7 sp3 hybrid set';
    const fig = await createFigure(title);
    await fake.stop();
    await post(`/api/figures/${fig.id}/submit`, tok.illustrator).expect(200);
    await new Promise((r) => setTimeout(r, 2500));
    expect(mailsFor(title)).toEqual([]);
    const restartedAt = Date.now();
    await fake.start();
    const [mail] = await waitFor('the delayed notice', async () => {
      const m = mailsFor(title);
      return m.length ? m : undefined;
    }, 40000, 200);
    expect(mail.to).toEqual([emails.editor]);
    expect(Date.parse(mail.receivedAt)).toBeGreaterThanOrEqual(restartedAt - 1000);
    // it took more than one attempt: the first ones met a closed port
    const redis = new Redis(process.env.REDIS_URL!, { maxRetriesPerRequest: null });
    const queue = new Queue(QUEUES.mail, { connection: redis });
    try {
      const jobs = await queue.getJobs(['completed'], 0, 500);
      const job = jobs.find((j) => (j.data as { subject: string }).subject.includes(`${title} ${RUN_ID}`))!;
      expect(job.attemptsMade).toBeGreaterThanOrEqual(2);
      // 1 s doubling to a try a minute: 70 tries span more than an hour of mail-server outage (job-options.ts).
      expect(job.opts.attempts).toBe(70);
      expect(job.opts.backoff).toEqual({ type: 'capped', delay: 1000 });
      // The BullMQ job is the notice's outbox row, which the runner marked done: a re-delivery would not send it again.
      const [row] = await t.ds.query(`SELECT name, state FROM outbox WHERE id = $1`, [job.id]);
      expect(row).toEqual({ name: 'notice', state: 'done' });
      expect(mailsFor(title)).toHaveLength(1);
    } finally {
      await queue.close();
      await redis.quit();
    }
  }, 60000);
});
