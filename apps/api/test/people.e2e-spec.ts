import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { MemberDto, Page, SubjectAuditEntryDto, UserAdminDto } from '@psiform/contracts';
import { auth, clearLoginCounters, demoTokens, login, runEmail, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp, newAccount } from './support';
import { MailFake, freePort, type OutboxEntry } from './editorial-support';
import { startWorkerProcess, waitFor, type WorkerProcess } from './worker-process';

/**
 * People and publications as an admin runs them: invitations with one-time links (mailed through the worker to our
 * own SMTP fake), roles, deactivation, password resets, publications with members and their roles, and the audit of
 * every change. Ends with the role × membership matrix of every route this feature added.
 */
describe('people and publications (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess | undefined;
  let fake: MailFake;
  let dir: string;
  let pubId: string;
  let adminId: string;
  const base = 'https://figures.example.org/desk';

  const post = (path: string, token: string | null, body: object = {}) => {
    const r = t.http().post(path);
    return (token ? r.set(auth(token)) : r).send(body);
  };
  const patch = (path: string, token: string, body: object) => t.http().patch(path).set(auth(token)).send(body);
  const mailTo = async (email: string, n = 1): Promise<OutboxEntry[]> => {
    await waitFor(`${n} mail(s) to ${email}`, async () => fake.messages().filter((m) => m.to.includes(email)).length >= n, 20000);
    return fake.messages().filter((m) => m.to.includes(email));
  };
  const tokenOf = (m: OutboxEntry) => {
    const match = /set-password#token=([A-Za-z0-9_-]+)/.exec(m.text);
    if (!match) throw new Error(`no link in: ${m.text}`);
    return match[1];
  };
  const auditOf = async (subjectKind: string, subjectId: string) =>
    (await t.http().get('/api/audit').query({ subjectKind, subjectId }).set(auth(tok.admin)).expect(200)).body as Page<SubjectAuditEntryDto>;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'psiform-people-e2e-'));
    fake = new MailFake(await freePort(), join(dir, 'outbox.jsonl'));
    await fake.start();
    t = await startTestApp({ MAIL_OUTBOX_FILE: fake.outbox, PUBLIC_BASE_URL: `${base}/` });
    tok = await demoTokens(t);
    adminId = (await t.http().get('/api/auth/me').set(auth(tok.admin)).expect(200)).body.id;
    pubId = (await post('/api/publications', tok.admin, { title: `Field Guide to Nodes ${RUN_ID}`, publisher: 'Harrowgate Press', kind: 'book', lengthUnit: 'bohr' }).expect(201)).body.id;
    worker = await startWorkerProcess({ SMTP_URL: fake.url });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    await t?.close();
    await fake?.stop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }, 30000);

  it('an invitation mails a one-time link (text and HTML) under PUBLIC_BASE_URL; only its hash is stored; it works once', async () => {
    const email = runEmail('invitee');
    const res = await post('/api/users/invitations', tok.admin, { email: email.toUpperCase(), displayName: 'Odile Marsh', role: 'illustrator' }).expect(201);
    expect(res.body).toMatchObject({ email, displayName: 'Odile Marsh', role: 'illustrator', state: 'invited', memberships: [] });
    expect(res.body.lastLinkSentAt).not.toBeNull();
    // Invited: no password, so no sign-in.
    await post('/api/auth/login', null, { email, password: 'anything-at-all' }).expect(401);

    const [mail] = await mailTo(email);
    expect(mail.subject).toBe('You are invited to Psiform');
    expect(mail.text).toContain(`${base}/set-password#token=`);
    expect(mail.html).toContain(`href="${base}/set-password#token=`);
    const token = tokenOf(mail);
    const [{ token_hash: stored }] = await t.ds.query(`SELECT token_hash FROM user_links WHERE user_id = $1`, [res.body.id]);
    expect(stored).toMatch(/^[0-9a-f]{64}$/);
    const rawHit = await t.ds.query(`SELECT count(*)::int AS n FROM user_links WHERE token_hash = $1`, [token]);
    expect(rawHit[0].n).toBe(0); // the token itself is nowhere in the table

    const info = await post('/api/auth/link', null, { token }).expect(200);
    expect(info.body).toMatchObject({ purpose: 'invite', email, displayName: 'Odile Marsh' });
    const short = await post('/api/auth/set-password', null, { token, password: 'short' }).expect(400);
    expect(short.body.message).toEqual(['password must be at least 10 characters']);
    const set = await post('/api/auth/set-password', null, { token, password: 'nodal-planes-42' }).expect(200);
    expect(set.body.email).toBe(email);
    const again = await post('/api/auth/set-password', null, { token, password: 'another-password-1' }).expect(400);
    expect(again.body.message).toEqual(['token: this link is not valid, has expired or was already used; ask for a new one']);
    await post('/api/auth/link', null, { token }).expect(400);
    const session = await login(t, email, 'nodal-planes-42');
    expect(session.user.role).toBe('illustrator');
    const user = (await t.http().get(`/api/users/${res.body.id}`).set(auth(tok.admin)).expect(200)).body as UserAdminDto;
    expect(user.state).toBe('active');
    expect((await auditOf('user', res.body.id)).items.map((e) => e.action)).toEqual(['password_set', 'user_invite']);
  });

  it('an expired link is refused; a new invitation makes the older link stop working', async () => {
    const email = runEmail('late');
    const u = (await post('/api/users/invitations', tok.admin, { email, displayName: 'Late Larkin', role: 'editor' }).expect(201)).body;
    const first = tokenOf((await mailTo(email))[0]);
    await post(`/api/users/${u.id}/invitation`, tok.admin).expect(200);
    const second = tokenOf((await mailTo(email, 2))[1]);
    expect(second).not.toBe(first);
    await post('/api/auth/set-password', null, { token: first, password: 'long-enough-pw' }).expect(400);
    await t.ds.query(`UPDATE user_links SET expires_at = now() - interval '1 minute' WHERE user_id = $1`, [u.id]);
    await post('/api/auth/set-password', null, { token: second, password: 'long-enough-pw' }).expect(400);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM users WHERE id = $1 AND password_hash IS NULL`, [u.id]);
    expect(n).toBe(1);
    await post('/api/auth/set-password', null, { token: 'x'.repeat(43), password: 'long-enough-pw' }).expect(400);
    const missing = await post('/api/auth/set-password', null, { password: 'long-enough-pw' }).expect(400);
    expect(missing.body.message).toContain('token must be a string');
  });

  it('duplicate e-mails say so (any case) and store nothing; bad input names the field', async () => {
    const email = runEmail('twice');
    await post('/api/users/invitations', tok.admin, { email, displayName: 'First', role: 'editor' }).expect(201);
    const dup = await post('/api/users/invitations', tok.admin, { email: email.toUpperCase(), displayName: 'Second', role: 'editor' }).expect(409);
    expect(dup.body.message).toBe(`email: ${email} is already registered`);
    const demo = await post('/api/users/invitations', tok.admin, { email: 'editor@demo.psiform.test', displayName: 'X', role: 'editor' }).expect(409);
    expect(demo.body.message).toBe('email: editor@demo.psiform.test is already registered');
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM users WHERE email = $1`, [email]);
    expect(n).toBe(1);
    expect((await post('/api/users/invitations', tok.admin, { email: 'nope', displayName: 'X', role: 'editor' }).expect(400)).body.message).toEqual(['email must be a valid email address']);
    expect((await post('/api/users/invitations', tok.admin, { email: runEmail('r'), displayName: ' ', role: 'editor' }).expect(400)).body.message).toEqual(['displayName must not be empty']);
    expect((await post('/api/users/invitations', tok.admin, { email: runEmail('r'), displayName: 'X', role: 'boss' }).expect(400)).body.message).toEqual([
      'role must be one of: illustrator, editor, art_director, admin',
    ]);
    const badQuery = await t.http().get('/api/users').query({ sort: 'password', pageSize: 0 }).set(auth(tok.admin)).expect(400);
    expect(badQuery.body.message).toEqual(expect.arrayContaining(['sort must be one of: displayName, email, role, state, createdAt', 'pageSize must be 1..100']));
  });

  it('the People table sorts, filters and pages on the server', async () => {
    const names = ['Ayla Quarry', 'Bram Quarry', 'Cato Quarry'];
    for (const [i, n] of names.entries()) await post('/api/users', tok.admin, { email: runEmail(`quarry${i}`), displayName: n, password: 'long-enough-pw', role: i === 1 ? 'editor' : 'illustrator' }).expect(201);
    const q = { q: `quarry`, sort: 'displayName', order: 'desc', pageSize: 2 };
    const p1 = (await t.http().get('/api/users').query({ ...q, page: 1 }).set(auth(tok.admin)).expect(200)).body as Page<UserAdminDto>;
    const p2 = (await t.http().get('/api/users').query({ ...q, page: 2 }).set(auth(tok.admin)).expect(200)).body as Page<UserAdminDto>;
    expect(p1.total).toBe(3);
    expect([...p1.items, ...p2.items].map((u) => u.displayName)).toEqual(['Cato Quarry', 'Bram Quarry', 'Ayla Quarry']);
    const editors = (await t.http().get('/api/users').query({ q: 'quarry', role: 'editor' }).set(auth(tok.admin)).expect(200)).body as Page<UserAdminDto>;
    expect(editors.items.map((u) => u.displayName)).toEqual(['Bram Quarry']);
    const invited = (await t.http().get('/api/users').query({ q: RUN_ID, state: 'invited' }).set(auth(tok.admin)).expect(200)).body as Page<UserAdminDto>;
    expect(invited.items.every((u) => u.state === 'invited')).toBe(true);
    // A search for "%" matches the character, not everything.
    expect(((await t.http().get('/api/users').query({ q: '%' }).set(auth(tok.admin)).expect(200)).body as Page<UserAdminDto>).total).toBe(0);
  });

  it('a role change is audited; deactivation ends every session at once and blocks sign-in; reactivation needs a new sign-in', async () => {
    const u = await newAccount(t, tok.admin, { name: 'deact', displayName: 'Dora Vane', role: 'illustrator' });
    const { email, token } = u;
    await t.http().get('/api/auth/me').set(auth(token)).expect(200);
    const changed = (await patch(`/api/users/${u.id}`, tok.admin, { role: 'editor' }).expect(200)).body as UserAdminDto;
    expect(changed.role).toBe('editor');
    expect((await t.http().get('/api/auth/me').set(auth(token)).expect(200)).body.role).toBe('editor');

    await patch(`/api/users/${u.id}`, tok.admin, { active: false }).expect(200);
    const refused = await t.http().get('/api/auth/me').set(auth(token)).expect(401);
    expect(refused.body.message).toBe('this account is deactivated');
    const signIn = await post('/api/auth/login', null, { email, password: 'long-enough-pw' }).expect(401);
    expect(signIn.body.message).toBe('this account is deactivated; ask an administrator');
    await patch(`/api/users/${u.id}`, tok.admin, { active: true }).expect(200);
    // The old token stays dead; a new sign-in works.
    expect((await t.http().get('/api/auth/me').set(auth(token)).expect(401)).body.message).toBe('this session has ended; sign in again');
    await t.http().get('/api/auth/me').set(auth((await login(t, email, 'long-enough-pw')).accessToken)).expect(200);
    expect((await auditOf('user', u.id)).items.map((e) => [e.action, e.note, e.actorId])).toEqual([
      ['user_reactivate', 'reactivated: may sign in again', adminId],
      ['user_deactivate', 'deactivated: sign-in refused and every session ended', adminId],
      ['user_role', 'role illustrator → editor', adminId],
      ['user_create', 'created as illustrator with a password set by an administrator', adminId],
    ]);
    await clearLoginCounters(t.redis, [email]);
  });

  it('an admin cannot deactivate or demote themselves; an empty change is 400', async () => {
    expect((await patch(`/api/users/${adminId}`, tok.admin, { active: false }).expect(409)).body.message).toBe('active: you cannot deactivate your own account');
    expect((await patch(`/api/users/${adminId}`, tok.admin, { role: 'editor' }).expect(409)).body.message).toBe('role: you cannot change your own role');
    expect((await patch(`/api/users/${adminId}`, tok.admin, {}).expect(400)).body.message).toEqual(['displayName, role or active is required']);
    expect((await patch(`/api/users/${adminId}`, tok.admin, { active: 'no' }).expect(400)).body.message).toEqual(['active must be true or false']);
  });

  it('password reset by e-mail: admin-sent and self-service links work once and end older sessions; unknown addresses get the same answer', async () => {
    const email = runEmail('reset');
    const u = (await post('/api/users', tok.admin, { email, displayName: 'Rhea Stone', password: 'first-password-1', role: 'editor' }).expect(201)).body;
    const old = (await login(t, email, 'first-password-1')).accessToken;
    await post(`/api/users/${u.id}/password-reset`, tok.admin).expect(200);
    const [mail] = await mailTo(email);
    expect(mail.subject).toBe('Reset your Psiform password');
    const token = tokenOf(mail);
    expect((await post('/api/auth/link', null, { token }).expect(200)).body.purpose).toBe('reset');
    await post('/api/auth/set-password', null, { token, password: 'second-password-2' }).expect(200);
    await t.http().get('/api/auth/me').set(auth(old)).expect(401);
    await post('/api/auth/login', null, { email, password: 'first-password-1' }).expect(401);
    await login(t, email, 'second-password-2');

    const known = await post('/api/auth/password-reset', null, { email: email.toUpperCase() }).expect(202);
    const unknown = await post('/api/auth/password-reset', null, { email: runEmail('nobody') }).expect(202);
    expect(unknown.body).toEqual(known.body);
    const self = tokenOf((await mailTo(email, 2))[1]);
    await post('/api/auth/set-password', null, { token: self, password: 'third-password-3' }).expect(200);
    await login(t, email, 'third-password-3');
    expect((await auditOf('user', u.id)).items.map((e) => e.action)).toEqual(['password_reset', 'reset_requested', 'password_reset', 'reset_sent', 'user_create']);
    // Wrong kind of link for the account's state.
    const inv = (await post('/api/users/invitations', tok.admin, { email: runEmail('inv2'), displayName: 'Ivo', role: 'editor' }).expect(201)).body;
    expect((await post(`/api/users/${inv.id}/password-reset`, tok.admin).expect(409)).body.message).toBe('this person has not chosen a password yet: send the invitation again instead');
    expect((await post(`/api/users/${u.id}/invitation`, tok.admin).expect(409)).body.message).toBe('this person has already chosen a password: send a password reset instead');
    await clearLoginCounters(t.redis, [email]);
  });

  it('publications: create and edit (length unit Å or a₀), members with their role, each change audited; the member sees only their publications', async () => {
    const u = await newAccount(t, tok.admin, { name: 'member', displayName: 'Mina Holt', role: 'illustrator' });
    const { email, token: mine } = u;
    expect((await t.http().get('/api/publications').set(auth(mine)).expect(200)).body).toEqual([]);

    const edited = await patch(`/api/publications/${pubId}`, tok.admin, { lengthUnit: 'angstrom', publisher: 'Harrowgate Academic' }).expect(200);
    expect(edited.body).toMatchObject({ id: pubId, lengthUnit: 'angstrom', publisher: 'Harrowgate Academic', memberCount: 0 });
    expect((await patch(`/api/publications/${pubId}`, tok.admin, { lengthUnit: 'nm' }).expect(400)).body.message).toEqual(['lengthUnit must be one of: angstrom, bohr']);
    expect((await patch(`/api/publications/${pubId}`, tok.admin, { title: '  ' }).expect(400)).body.message).toEqual(['title must not be empty']);

    await post(`/api/publications/${pubId}/members`, tok.admin, { userId: u.id, role: 'editor' }).expect(201);
    const members = (await t.http().get(`/api/publications/${pubId}/members`).set(auth(mine)).expect(200)).body as MemberDto[];
    expect(members.map((m) => [m.email, m.role, m.publicationRole, m.state])).toEqual([[email, 'illustrator', 'editor', 'active']]);
    expect((await t.http().get('/api/publications').set(auth(mine)).expect(200)).body.map((p: { id: string }) => p.id)).toEqual([pubId]);
    await t.http().put(`/api/publications/${pubId}/members/${u.id}`).set(auth(tok.admin)).send({ role: 'illustrator' }).expect(200);
    expect((await t.http().get(`/api/users/${u.id}`).set(auth(tok.admin)).expect(200)).body.memberships).toEqual([
      { publicationId: pubId, publicationTitle: `Field Guide to Nodes ${RUN_ID}`, role: 'illustrator' },
    ]);
    await t.http().delete(`/api/publications/${pubId}/members/${u.id}`).set(auth(tok.admin)).expect(204);
    await t.http().delete(`/api/publications/${pubId}/members/${u.id}`).set(auth(tok.admin)).expect(404);
    await t.http().get(`/api/publications/${pubId}`).set(auth(mine)).expect(404);

    const audit = (await auditOf('publication', pubId)).items.map((e) => [e.action, e.note]);
    expect(audit).toEqual([
      ['member_remove', `Mina Holt <${email}> removed from "Field Guide to Nodes ${RUN_ID}" (was illustrator)`],
      ['member_role', `Mina Holt in "Field Guide to Nodes ${RUN_ID}": editor → illustrator`],
      ['member_add', `Mina Holt <${email}> added to "Field Guide to Nodes ${RUN_ID}" as editor`],
      ['publication_edit', 'publisher "Harrowgate Press" → "Harrowgate Academic"; length unit a₀ → Å'],
      ['publication_create', `created "Field Guide to Nodes ${RUN_ID}" (book, Harrowgate Press), lengths in a₀`],
    ]);
    expect((await auditOf('user', u.id)).items.map((e) => e.action)).toEqual(['member_remove', 'member_role', 'member_add', 'user_create']);
  });

  it('the Publications table sorts, filters and pages on the server, with member counts', async () => {
    for (const [i, k] of (['book', 'journal_volume', 'book'] as const).entries()) {
      await post('/api/publications', tok.admin, { title: `Ledger ${String.fromCharCode(67 - i)} ${RUN_ID}`, publisher: 'Quill & Slate', kind: k }).expect(201);
    }
    const page = (await t.http().get('/api/publications/directory').query({ q: `Ledger`, sort: 'title', order: 'asc', pageSize: 2 }).set(auth(tok.admin)).expect(200)).body;
    expect(page.total).toBe(3);
    expect(page.items.map((p: { title: string }) => p.title)).toEqual([`Ledger A ${RUN_ID}`, `Ledger B ${RUN_ID}`]);
    const journals = (await t.http().get('/api/publications/directory').query({ q: RUN_ID, kind: 'journal_volume' }).set(auth(tok.admin)).expect(200)).body;
    expect(journals.items.map((p: { title: string }) => p.title)).toEqual([`Ledger B ${RUN_ID}`]);
    const demo = (await t.http().get('/api/publications/directory').query({ sort: 'members', order: 'desc', pageSize: 100 }).set(auth(tok.admin)).expect(200)).body;
    const counts = demo.items.map((p: { memberCount: number }) => p.memberCount);
    expect(counts).toEqual([...counts].sort((a: number, b: number) => b - a));
    expect(demo.items.find((p: { id: string }) => p.id === DEMO_PUBLICATION.id).memberCount).toBeGreaterThanOrEqual(4);
  });

  it('role × membership matrix: every route of this feature', async () => {
    const { email: outsiderEmail, token: outsider } = await newAccount(t, tok.admin, { name: 'outsider', displayName: 'Otto Side', role: 'editor' });
    const target = (await post('/api/users', tok.admin, { email: runEmail('target'), displayName: 'Tess Target', password: 'long-enough-pw', role: 'illustrator' }).expect(201)).body;
    const demoPub = DEMO_PUBLICATION.id;
    const ghost = '00000000-0000-4000-8000-00000000abcd';
    const demoDescription = (await t.http().get(`/api/publications/${demoPub}`).set(auth(tok.admin)).expect(200)).body.description as string;
    // Callers: the demo illustrator, editor and art director are members of the demo publication; the outsider is an
    // editor of no publication; the admin sees all; anonymous carries no token.
    const callers: Record<string, string | null> = { admin: tok.admin, illustrator: tok.illustrator, editor: tok.editor, art_director: tok.artDirector, outsider, anonymous: null };
    type Row = [method: 'get' | 'post' | 'patch' | 'put' | 'delete', path: string, body: object | undefined, expect: Record<string, number>];
    const adminOnly = (ok: number): Record<string, number> => ({ admin: ok, illustrator: 403, editor: 403, art_director: 403, outsider: 403, anonymous: 401 });
    const rows: Row[] = [
      ['get', '/api/users', undefined, adminOnly(200)],
      ['get', `/api/users/${target.id}`, undefined, adminOnly(200)],
      ['patch', `/api/users/${target.id}`, { displayName: 'Tess Target' }, adminOnly(200)],
      ['post', '/api/users/invitations', { email: 'x', displayName: 'X', role: 'editor' }, adminOnly(400)],
      ['post', `/api/users/${target.id}/invitation`, undefined, adminOnly(409)],
      ['post', `/api/users/${ghost}/password-reset`, undefined, adminOnly(404)],
      ['get', '/api/audit', undefined, adminOnly(200)],
      ['get', '/api/publications/directory', undefined, adminOnly(200)],
      ['patch', `/api/publications/${demoPub}`, { description: demoDescription }, adminOnly(200)],
      ['patch', `/api/publications/${ghost}`, { description: 'x' }, adminOnly(404)],
      ['put', `/api/publications/${demoPub}/members/${target.id}`, { role: 'editor' }, adminOnly(404)],
      ['delete', `/api/publications/${demoPub}/members/${target.id}`, undefined, adminOnly(404)],
      ['get', `/api/publications/${demoPub}/members`, undefined, { admin: 200, illustrator: 200, editor: 200, art_director: 200, outsider: 404, anonymous: 401 }],
      ['get', `/api/publications/${pubId}/members`, undefined, { admin: 200, illustrator: 404, editor: 404, art_director: 404, outsider: 404, anonymous: 401 }],
      ['post', '/api/auth/link', { token: 'not-a-token' }, { admin: 400, illustrator: 400, editor: 400, art_director: 400, outsider: 400, anonymous: 400 }],
      ['post', '/api/auth/set-password', { token: 'not-a-token', password: 'long-enough-pw' }, { admin: 400, illustrator: 400, editor: 400, art_director: 400, outsider: 400, anonymous: 400 }],
      ['post', '/api/auth/password-reset', { email: runEmail('matrix') }, { admin: 202, illustrator: 202, editor: 202, art_director: 202, outsider: 202, anonymous: 202 }],
    ];
    const wrong: string[] = [];
    for (const [method, path, body, expected] of rows) {
      for (const [who, token] of Object.entries(callers)) {
        let r = t.http()[method](path);
        if (token) r = r.set(auth(token));
        const res = body === undefined ? await r : await r.send(body);
        if (res.status !== expected[who]) wrong.push(`${method.toUpperCase()} ${path} as ${who}: ${res.status} (expected ${expected[who]}) ${JSON.stringify(res.body)}`);
      }
    }
    expect(wrong).toEqual([]);
    await clearLoginCounters(t.redis, [outsiderEmail]);
  });
});
