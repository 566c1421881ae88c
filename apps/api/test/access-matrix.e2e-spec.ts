import { auth, login, runEmail, smallRecipe, startTestApp, DEMO_PASSWORD, RUN_ID, type TestApp } from './support';

/**
 * Role × membership matrix for every scoped write and read (issue "Stays up and stays scoped"): one publication P
 * with an owning illustrator, a second illustrator, an editor and an art director; outsiders of another publication
 * Q (an illustrator and an art director); the demo admin. Each cell states the expected status, and every refused
 * write is followed by a check that nothing changed. The rules live in MembershipService.ACCESS_RULES.
 */
type Caller = 'owner' | 'illustrator2' | 'editor' | 'artDirector' | 'admin' | 'outsiderIllustrator' | 'outsiderArtDirector';
const CALLERS: Caller[] = ['owner', 'illustrator2', 'editor', 'artDirector', 'admin', 'outsiderIllustrator', 'outsiderArtDirector'];
/** Expected status per caller, in CALLERS order. */
type Row = [number, number, number, number, number, number, number];

describe('access matrix: roles × membership (e2e)', () => {
  let t: TestApp;
  const tok = {} as Record<Caller, string>;
  const ids = {} as Record<Caller, string>;
  let P: string;
  let Q: string;
  let figure: string;
  let set: string;
  let book: string; // swatchbook of P
  let publisherBook: string; // swatchbook of every publication of P's publisher
  let foreignBook: string; // swatchbook of Q
  const publisherP = `Matrix Press ${RUN_ID}`;
  const colors = { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' };

  beforeAll(async () => {
    t = await startTestApp();
    const admin = (await login(t, 'admin@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    tok.admin = admin;
    const post = (path: string, body: unknown, token = admin) => t.http().post(path).set(auth(token)).send(body as object);
    P = (await post('/api/publications', { title: `Matrix P ${RUN_ID}`, publisher: publisherP, kind: 'book' }).expect(201)).body.id;
    Q = (await post('/api/publications', { title: `Matrix Q ${RUN_ID}`, publisher: `Other Press ${RUN_ID}`, kind: 'journal_volume' }).expect(201)).body.id;
    const people: [Exclude<Caller, 'admin'>, string, string][] = [
      ['owner', 'illustrator', P],
      ['illustrator2', 'illustrator', P],
      ['editor', 'editor', P],
      ['artDirector', 'art_director', P],
      ['outsiderIllustrator', 'illustrator', Q],
      ['outsiderArtDirector', 'art_director', Q],
    ];
    for (const [who, role, pub] of people) {
      const email = runEmail(`matrix-${who.toLowerCase()}`);
      ids[who] = (await post('/api/users', { email, displayName: `Matrix ${who}`, password: 'matrix-password-1', role }).expect(201)).body.id;
      await post(`/api/publications/${pub}/members`, { userId: ids[who] }).expect(201);
      tok[who] = (await login(t, email, 'matrix-password-1')).accessToken;
    }
    figure = (await post('/api/figures', { publicationId: P, title: `Matrix figure ${RUN_ID}`, recipe: smallRecipe() }, tok.owner).expect(201)).body.id;
    set = (await post('/api/figure-sets', { publicationId: P, title: `Matrix set ${RUN_ID}`, figureIds: [figure], columns: 1 }, tok.editor).expect(201)).body.id;
    book = (await post('/api/swatchbooks', { name: `Matrix book ${RUN_ID}`, colors, publicationId: P }, tok.artDirector).expect(201)).body.id;
    publisherBook = (await post('/api/swatchbooks', { name: `Matrix publisher book ${RUN_ID}`, colors, publisher: publisherP }, admin).expect(201)).body.id;
    foreignBook = (await post('/api/swatchbooks', { name: `Matrix foreign book ${RUN_ID}`, colors, publicationId: Q }, tok.outsiderArtDirector).expect(201)).body.id;
  }, 120_000);

  afterAll(async () => {
    if (!t) return;
    await t.ds.query(`DELETE FROM house_styles WHERE publication_id IN ($1, $2)`, [P, Q]);
    await t.ds.query(`DELETE FROM figure_sets WHERE publication_id IN ($1, $2)`, [P, Q]);
    await t.ds.query(`DELETE FROM swatchbooks WHERE name LIKE $1`, [`%${RUN_ID}%`]);
    await t.close();
  });

  const figureState = async () => (await t.ds.query(`SELECT title, current_version FROM figures WHERE id = $1`, [figure]))[0];
  const jobCount = async () => (await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE publication_id = $1`, [P]))[0].n as number;
  const bookVersion = async (id: string) => (await t.ds.query(`SELECT version, locked, name FROM swatchbooks WHERE id = $1`, [id]))[0];

  /** Runs one row: each caller's status as expected; after each refusal, `unchanged` must still hold. */
  async function row(expected: Row, call: (token: string, who: Caller) => Promise<{ status: number; body: unknown }>, snapshot?: () => Promise<unknown>) {
    const got: Record<string, number> = {};
    for (const [i, who] of CALLERS.entries()) {
      const before = snapshot ? await snapshot() : undefined;
      const res = await call(tok[who], who);
      got[who] = res.status;
      if (res.status >= 400 && snapshot) expect({ who, state: await snapshot() }).toEqual({ who, state: before });
      if (res.status === 403 || res.status === 404) expect(typeof (res.body as { message?: unknown }).message).toBe('string');
      expect({ who, status: res.status }).toEqual({ who, status: expected[i] });
    }
    return got;
  }

  //                 owner ill2 editor artDir admin outIll outAD
  it('GET a figure: every member; outsiders 404', () => row([200, 200, 200, 200, 200, 404, 404], (k) => t.http().get(`/api/figures/${figure}`).set(auth(k))));

  it('PATCH a figure: its illustrator and admins only (another illustrator 403, non-members 404)', async () => {
    let n = 0;
    await row([200, 403, 403, 403, 200, 404, 403], (k) => t.http().patch(`/api/figures/${figure}`).set(auth(k)).send({ title: `Matrix figure ${RUN_ID} #${++n}` }), figureState);
    await row([200, 403, 403, 403, 200, 404, 403], (k) => t.http().patch(`/api/figures/${figure}`).set(auth(k)).send({ recipe: smallRecipe({ surface: { rule: 'enclosed', fraction: 0.5 + 0.01 * ++n } }) }), figureState);
  });

  it('POST an export of a figure: its illustrator, editors, art directors, admins', () =>
    row([201, 403, 201, 201, 201, 404, 404], (k) => t.http().post(`/api/figures/${figure}/exports`).set(auth(k)).send({ format: 'glb' }), jobCount));

  it('POST a mesh job: illustrators and admins of the publication', () => row([201, 201, 403, 403, 201, 404, 403], (k) => t.http().post(`/api/figures/${figure}/meshes`).set(auth(k)), jobCount));

  it('POST submit: only its illustrator or an admin (tried on a copy each time, nothing submitted on refusal)', async () => {
    const copies: string[] = [];
    for (let i = 0; i < CALLERS.length; i++) copies.push((await t.http().post('/api/figures').set(auth(tok.owner)).send({ publicationId: P, title: `Matrix submit ${i} ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body.id);
    let i = 0;
    const status = async () => (await t.ds.query(`SELECT array_agg(status ORDER BY title) AS s FROM figures WHERE title LIKE $1`, [`Matrix submit % ${RUN_ID}`]))[0].s;
    await row([200, 403, 403, 403, 200, 404, 403], (k) => t.http().post(`/api/figures/${copies[i++]}/submit`).set(auth(k)), status);
  });

  it('POST a figure set: only with figures the caller may export (an illustrator cannot gather someone else’s)', () =>
    row([201, 403, 201, 201, 201, 404, 404], (k) => t.http().post('/api/figure-sets').set(auth(k)).send({ publicationId: P, title: `Matrix set x ${RUN_ID}`, figureIds: [figure], columns: 1 }), async () => (await t.ds.query(`SELECT count(*)::int AS n FROM figure_sets WHERE publication_id = $1`, [P]))[0].n));

  it("POST a figure set's export: the same rule for every figure of the set", () =>
    row([201, 403, 201, 201, 201, 404, 404], (k) => t.http().post(`/api/figure-sets/${set}/exports`).set(auth(k)).send({ format: 'png', widthMm: 40, heightMm: 30, dpi: 300 }), jobCount));

  it("GET a publication's swatchbook (and its versions, checks, file): members only", async () => {
    for (const sub of ['', '/versions', '/checks', '/export']) await row([200, 200, 200, 200, 200, 404, 404], (k) => t.http().get(`/api/swatchbooks/${book}${sub}`).set(auth(k)));
  });

  it("PATCH, lock and unlock a publication's swatchbook: its art directors and admins; other publications' art directors 404", async () => {
    let n = 0;
    const snap = () => bookVersion(book);
    await row([403, 403, 403, 200, 200, 403, 404], (k) => t.http().patch(`/api/swatchbooks/${book}`).set(auth(k)).send({ name: `Matrix book ${RUN_ID} r${++n}` }), snap);
    await row([403, 403, 403, 200, 200, 403, 404], (k, who) => t.http().post(`/api/swatchbooks/${book}/${who === 'admin' ? 'unlock' : 'lock'}`).set(auth(k)), snap);
  });

  it("a publisher's swatchbook is read in every publication of that publisher and nowhere else", () =>
    row([200, 200, 200, 200, 200, 404, 404], (k) => t.http().get(`/api/swatchbooks/${publisherBook}`).set(auth(k))));

  it("another publication's swatchbook is invisible: 404 to read or change it", async () => {
    await row([404, 404, 404, 404, 200, 200, 200], (k) => t.http().get(`/api/swatchbooks/${foreignBook}`).set(auth(k)));
    await row([403, 403, 403, 404, 200, 403, 200], (k) => t.http().patch(`/api/swatchbooks/${foreignBook}`).set(auth(k)).send({ colors: { positive: '#aa0000' } }), () => bookVersion(foreignBook));
  });

  it('lists only the swatchbooks of the caller’s publications and publishers', async () => {
    const listed = async (who: Caller) => ((await t.http().get('/api/swatchbooks').set(auth(tok[who])).expect(200)).body as { id: string }[]).map((s) => s.id);
    for (const who of ['owner', 'editor', 'artDirector'] as const) {
      const l = await listed(who);
      expect(l).toEqual(expect.arrayContaining([book, publisherBook]));
      expect(l).not.toContain(foreignBook);
    }
    expect(await listed('outsiderArtDirector')).toEqual([foreignBook]);
    const usable = ((await t.http().get(`/api/swatchbooks?publicationId=${P}`).set(auth(tok.artDirector)).expect(200)).body as { id: string }[]).map((s) => s.id).sort();
    expect(usable).toEqual([book, publisherBook].sort());
    await t.http().get(`/api/swatchbooks?publicationId=${Q}`).set(auth(tok.artDirector)).expect(404);
  });

  it("creating a swatchbook needs membership of its publication; pinning needs one of that publication (or its publisher)", async () => {
    await t.http().post('/api/swatchbooks').set(auth(tok.outsiderArtDirector)).send({ name: `Matrix sneak ${RUN_ID}`, colors, publicationId: P }).expect(404);
    await t.http().post('/api/swatchbooks').set(auth(tok.outsiderArtDirector)).send({ name: `Matrix sneak ${RUN_ID}`, colors, publisher: publisherP }).expect(404);
    const none = await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: `Matrix nowhere ${RUN_ID}`, colors }).expect(400);
    expect(none.body.message[0]).toMatch(/^publicationId: /);
    const foreign = await t.http().put(`/api/publications/${P}/house-style`).set(auth(tok.admin)).send({ swatchbookId: foreignBook }).expect(400);
    expect(foreign.body.message).toEqual([`swatchbookId: no swatchbook ${foreignBook} in this publication`]);
    await t.http().put(`/api/publications/${P}/house-style`).set(auth(tok.artDirector)).send({ swatchbookId: publisherBook, allowOverride: true }).expect(200);
    await t.http().put(`/api/publications/${P}/house-style`).set(auth(tok.outsiderArtDirector)).send({ swatchbookId: foreignBook }).expect(404);
    expect((await t.ds.query(`SELECT swatchbook_id FROM house_styles WHERE publication_id = $1`, [P]))[0].swatchbook_id).toBe(publisherBook);
  });

  it("a recipe may name only a swatchbook of its own publication (or publisher): 400 naming the field, nothing stored", async () => {
    const before = await figureState();
    const bad = await t.http().patch(`/api/figures/${figure}`).set(auth(tok.owner)).send({ recipe: smallRecipe({ palette: { swatchbookId: foreignBook } }) }).expect(400);
    expect(bad.body.message).toEqual([`recipe.palette.swatchbookId: no swatchbook ${foreignBook} in this publication`]);
    expect(await figureState()).toEqual(before);
    await t.http().patch(`/api/figures/${figure}`).set(auth(tok.owner)).send({ recipe: smallRecipe({ palette: { swatchbookId: book } }) }).expect(200);
    await t.http().post('/api/figures').set(auth(tok.owner)).send({ publicationId: P, title: `Matrix named ${RUN_ID}`, recipe: smallRecipe({ palette: { swatchbookId: foreignBook } }) }).expect(400);
  });
  describe('colour checks that gate (issue 13): the impact, the pin and the batch re-render', () => {
    // Phases ΔE00 2.9 apart under simulated deuteranopia: an error-level failure of the swatchbook's colour checks.
    const failingColors = { positive: '#c0392b', negative: '#5a8a2a', background: '#ffffff', label: '#1a1a1a' };
    const reason = 'Printed as a duotone with hatching; red and green only on screen';
    let failingBook: string;
    const gateState = async () =>
      (
        await t.ds.query(
          `SELECT (SELECT swatchbook_id FROM house_styles WHERE publication_id = $1) AS pinned,
                  (SELECT count(*)::int FROM batches WHERE publication_id = $1) AS batches,
                  (SELECT count(*)::int FROM audit_entries WHERE subject_id = $1) AS audits`,
          [P],
        )
      )[0];

    beforeAll(async () => {
      failingBook = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: `Matrix failing ${RUN_ID}`, colors: failingColors, publicationId: P }).expect(201)).body.id;
    });

    //                 owner ill2 editor artDir admin outIll outAD
    it('GET the impact of a pin or a re-render: every member; outsiders 404; no token 401', async () => {
      await row([200, 200, 200, 200, 200, 404, 404], (k) => t.http().get(`/api/publications/${P}/house-style/impact?for=pin&swatchbookId=${failingBook}`).set(auth(k)), gateState);
      await row([200, 200, 200, 200, 200, 404, 404], (k) => t.http().get(`/api/publications/${P}/house-style/impact?for=rerender`).set(auth(k)), gateState);
      await t.http().get(`/api/publications/${P}/house-style/impact?for=pin`).expect(401);
    });

    it('PUT a failing swatchbook as the house style: 409 naming the failure for its art directors and admins, nothing stored', async () => {
      const got = await row([403, 403, 403, 409, 409, 403, 404], (k) => t.http().put(`/api/publications/${P}/house-style`).set(auth(k)).send({ swatchbookId: failingBook }), gateState);
      expect(got.artDirector).toBe(409);
      await t.http().put(`/api/publications/${P}/house-style`).send({ swatchbookId: failingBook, override: { reason } }).expect(401);
    });

    it('PUT it with a written reason: its art directors and admins; the others refused with nothing stored', async () => {
      await row([403, 403, 403, 200, 200, 403, 404], (k) => t.http().put(`/api/publications/${P}/house-style`).set(auth(k)).send({ swatchbookId: failingBook, override: { reason } }), gateState);
      expect((await gateState()).pinned).toBe(failingBook);
    });

    it('POST a batch re-render with the failing swatchbook: 409 without a reason, 201 with one, for its art directors and admins', async () => {
      await row([403, 403, 403, 409, 409, 403, 404], (k) => t.http().post(`/api/publications/${P}/rerender`).set(auth(k)), gateState);
      await row([403, 403, 403, 201, 201, 403, 404], (k) => t.http().post(`/api/publications/${P}/rerender`).set(auth(k)).send({ override: { reason } }), gateState);
      await t.http().post(`/api/publications/${P}/rerender`).send({ override: { reason } }).expect(401);
    });
  });
});
