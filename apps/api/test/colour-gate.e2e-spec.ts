import { PSIFORM_PALETTE, type BatchDto, type HouseStyleDto, type HouseStyleImpactDto, type Page, type SubjectAuditEntryDto } from '@psiform/contracts';
import { auth, demoTokens, staffedPublication, smallRecipe, startTestApp, RUN_ID, type TestApp } from './support';

/**
 * Colour checks that gate (issue 13, part 3): a swatchbook failing at error level (phases ΔE00 2.9 apart under
 * simulated deuteranopia, checkSwatchbook in libs/colour after Machado et al. 2009) cannot be pinned as a house style
 * or used for a batch re-render without a written reason; the reason is kept on the house style and audited there and
 * on every affected figure; bad input changes nothing. The confirmation lists the figures a pin or re-render affects.
 * The role × membership rows of these routes are in access-matrix.e2e-spec.ts.
 */
describe('colour checks that gate (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let pubId: string;
  let failing: string;
  let passing: string;
  let draftId: string;
  let reviewId: string;
  // Red and green that deuteranopia nearly merges: ΔE00 2.9 simulated (an error: below 10); the pair below passes.
  const FAILING = { positive: '#c0392b', negative: '#5a8a2a', background: '#ffffff', label: '#1f1d1a' };
  const PASSING = { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1f1d1a' };
  const REASON = 'Plates 3 and 4 print as a duotone with hatching; the red/green pair is only on screen';

  const post = (path: string, token: string, body: object = {}) => t.http().post(path).set(auth(token)).send(body);
  const put = (path: string, token: string, body: object) => t.http().put(path).set(auth(token)).send(body);
  const get = (path: string, token: string) => t.http().get(path).set(auth(token));
  const audit = async (figureId: string) => (await get(`/api/figures/${figureId}/audit`, tok.editor).expect(200)).body as { action: string; note: string | null }[];
  const subjectAudit = async () => ((await get(`/api/audit?subjectKind=house_style&subjectId=${pubId}`, tok.admin).expect(200)).body as Page<SubjectAuditEntryDto>).items;
  const stored = async () => ({
    house: (await t.ds.query(`SELECT swatchbook_id, override_reason FROM house_styles WHERE publication_id = $1`, [pubId]))[0] ?? null,
    audit: (await t.ds.query(`SELECT count(*)::int AS n FROM audit_entries WHERE subject_id = $1 OR figure_id = ANY($2)`, [pubId, [draftId, reviewId]]))[0].n,
    versions: (await t.ds.query(`SELECT count(*)::int AS n FROM figure_versions WHERE figure_id = ANY($1)`, [[draftId, reviewId]]))[0].n,
    batches: (await t.ds.query(`SELECT count(*)::int AS n FROM batches WHERE publication_id = $1`, [pubId]))[0].n,
  });

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
    pubId = await staffedPublication(t, tok, { title: `Colour Bench ${RUN_ID}`, publisher: `Harrowgate Press ${RUN_ID}`, kind: 'book' });
    failing = (await post('/api/swatchbooks', tok.artDirector, { name: `Red and green ${RUN_ID}`, colors: FAILING, publicationId: pubId }).expect(201)).body.id;
    passing = (await post('/api/swatchbooks', tok.artDirector, { name: `Brick and slate ${RUN_ID}`, colors: PASSING, publicationId: pubId }).expect(201)).body.id;
    draftId = (await post('/api/figures', tok.illustrator, { publicationId: pubId, title: `Plate 3 ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body.id;
    reviewId = (await post('/api/figures', tok.illustrator, { publicationId: pubId, title: `Plate 4 ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body.id;
    await post(`/api/figures/${reviewId}/submit`, tok.illustrator).expect(200);
  }, 60_000);

  afterAll(async () => {
    if (!t) return;
    await t.ds.query(`DELETE FROM house_styles WHERE publication_id = $1`, [pubId]);
    await t.close();
  });

  it('the confirmation lists the checks and every figure a pin affects, with its colour changes; nothing is stored by asking', async () => {
    const before = await stored();
    const impact = (await get(`/api/publications/${pubId}/house-style/impact?for=pin&swatchbookId=${failing}`, tok.artDirector).expect(200)).body as HouseStyleImpactDto;
    expect(impact.swatchbook).toEqual({ id: failing, name: `Red and green ${RUN_ID}`, version: 1 });
    expect(impact.gate).toMatchObject({ name: 'colour checks', blocks: true });
    expect(impact.gate.failures).toEqual([expect.stringMatching(/^positive and negative phases differ by ΔE00 2\.9 under simulated deuteranopia/)]);
    expect(impact.gate.warnings).toEqual([expect.stringMatching(/ΔE00 17\.5 under simulated protanopia/)]);
    const byId = Object.fromEntries(impact.figures.map((f) => [f.figureId, f]));
    expect(byId[draftId]).toMatchObject({ effect: 'next_save', affected: true, usesSwatchbook: false, reason: 'Draft: takes these colours at its next save' });
    expect(byId[draftId].changes.map((c) => `${c.what} ${c.from} → ${c.to}`)).toEqual(
      expect.arrayContaining([`positive phase colour ${PSIFORM_PALETTE.positive} → #c0392b`, `negative phase colour ${PSIFORM_PALETTE.negative} → #5a8a2a`]),
    );
    expect(byId[reviewId]).toMatchObject({ effect: 'kept', affected: true, reason: 'In review: keeps the colours it has until a new version' });
    const ok = (await get(`/api/publications/${pubId}/house-style/impact?for=pin&swatchbookId=${passing}`, tok.artDirector).expect(200)).body as HouseStyleImpactDto;
    expect(ok.gate).toMatchObject({ failures: [], warnings: [], blocks: false });
    expect(await stored()).toEqual(before);
  });

  it('bad input to the impact: 400 naming the field', async () => {
    expect((await get(`/api/publications/${pubId}/house-style/impact?for=sideways`, tok.artDirector).expect(400)).body.message).toEqual(['for must be one of pin, rerender']);
    expect((await get(`/api/publications/${pubId}/house-style/impact`, tok.artDirector).expect(400)).body.message).toEqual(['for must be one of pin, rerender']);
    expect((await get(`/api/publications/${pubId}/house-style/impact?for=pin&swatchbookId=x`, tok.artDirector).expect(400)).body.message).toEqual(['swatchbookId must be a UUID']);
    expect((await get(`/api/publications/${pubId}/house-style/impact?for=rerender`, tok.artDirector).expect(400)).body.message).toEqual(['swatchbookId: required while the publication has no house style']);
  });

  it('an art director is stopped from pinning a failing swatchbook, then pins it with a written reason audited on the house style and every affected figure', async () => {
    const before = await stored();
    const blocked = await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing }).expect(409);
    expect(blocked.body).toMatchObject({ statusCode: 409, error: 'Conflict', gate: 'colour checks', overridable: true });
    expect(blocked.body.failures).toEqual([expect.stringMatching(/under simulated deuteranopia/)]);
    expect(blocked.body.message).toMatch(/^colour checks failed \(1 failure\); to go ahead anyway, send override: \{ reason \} saying why: positive and negative phases/);
    const short = await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing, override: { reason: 'because' } }).expect(400);
    expect(short.body.message).toEqual(['override.reason: at least 10 characters: say why the failures are acceptable']);
    expect((await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing, override: 'yes' }).expect(400)).body.message).toEqual(['override must be an object { reason }']);
    expect((await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing, override: { reason: REASON, why: 1 } }).expect(400)).body.message[0]).toMatch(/^override\./);
    expect(await stored()).toEqual(before);

    const pinned = (await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing, override: { reason: REASON } }).expect(200)).body as HouseStyleDto;
    expect(pinned.colourOverride).toMatchObject({ reason: REASON, byName: expect.any(String), swatchbookVersion: 1 });
    expect(pinned.colourOverride!.failures).toEqual(blocked.body.failures);
    expect((await get(`/api/publications/${pubId}/house-style`, tok.illustrator).expect(200)).body.colourOverride.reason).toBe(REASON);
    const subject = await subjectAudit();
    expect(subject.map((e) => e.action)).toEqual(['colour_override', 'house_style_pin']);
    expect(subject[0].note).toContain(`colour checks overridden: ${REASON}`);
    expect(subject[1].note).toBe(`pinned swatchbook "Red and green ${RUN_ID}" v1`);
    for (const id of [draftId, reviewId]) {
      const last = (await audit(id)).at(-1)!;
      expect(last.action).toBe('colour_override');
      expect(last.note).toContain(REASON);
    }
    // Changing only the rules of the pinned swatchbook is not a new pin: no gate, the override stays.
    const rules = (await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: failing, requireColourSignOff: true }).expect(200)).body as HouseStyleDto;
    expect(rules.colourOverride?.reason).toBe(REASON);
    expect((await subjectAudit())[0]).toMatchObject({ action: 'house_style_pin', note: 'approval needs a colour sign-off' });
  });

  it('a batch re-render with the failing swatchbook is stopped too, then goes ahead with the reason on each new version, once', async () => {
    // The draft takes the pinned colours at its next save; then the swatchbook changes (and still fails).
    await t.http().patch(`/api/figures/${draftId}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 36 } }) }).expect(200);
    await t.http().patch(`/api/swatchbooks/${failing}`).set(auth(tok.artDirector)).send({ colors: { positive: '#b5533c', negative: '#6b7d2f' } }).expect(200);
    const preview = (await get(`/api/publications/${pubId}/house-style/impact?for=rerender`, tok.artDirector).expect(200)).body as HouseStyleImpactDto;
    expect(preview.gate.failures).toEqual([expect.stringMatching(/ΔE00 1\.4 under simulated deuteranopia/)]);
    expect(preview.figures.find((f) => f.figureId === draftId)).toMatchObject({ effect: 'rerender', usesSwatchbook: true });
    expect(preview.figures.find((f) => f.figureId === reviewId)).toMatchObject({ effect: 'kept', reason: 'does not use the pinned swatchbook' });

    const before = await stored();
    const stopped = await post(`/api/publications/${pubId}/rerender`, tok.artDirector).expect(409);
    expect(stopped.body).toMatchObject({ gate: 'colour checks', overridable: true, failures: preview.gate.failures });
    await post(`/api/publications/${pubId}/rerender`, tok.artDirector, { override: { reason: 'short' } }).expect(400);
    await post(`/api/publications/${pubId}/rerender`, tok.artDirector, { override: null }).expect(400);
    expect(await stored()).toEqual(before);

    const batch = (await post(`/api/publications/${pubId}/rerender`, tok.artDirector, { override: { reason: REASON } }).expect(201)).body as BatchDto;
    expect(batch.overrideReason).toBe(REASON);
    expect(batch.jobs.map((j) => j.figureId)).toEqual([draftId]);
    const [v] = await t.ds.query(`SELECT v.recipe->'palette' AS palette FROM figure_versions v JOIN figures f ON f.id = v.figure_id AND f.current_version = v.number WHERE f.id = $1`, [draftId]);
    expect(v.palette).toMatchObject({ swatchbookId: failing, positive: '#b5533c', negative: '#6b7d2f' });
    const trail = await audit(draftId);
    expect(trail.slice(-2).map((e) => e.action)).toEqual(['rerender', 'colour_override']);
    expect(trail.at(-1)!.note).toContain(`batch re-render with swatchbook "Red and green ${RUN_ID}" v2: colour checks overridden: ${REASON}`);
    expect((await subjectAudit())[0]).toMatchObject({ action: 'colour_override' });
    expect((await get(`/api/batches/${batch.batchId}`, tok.editor).expect(200)).body.overrideReason).toBe(REASON);

    // Idempotent: a second batch finds the draft already in these colours; no new version, no second override entry.
    const versions = (await stored()).versions;
    const again = (await post(`/api/publications/${pubId}/rerender`, tok.artDirector, { override: { reason: REASON } }).expect(201)).body as BatchDto;
    expect(again.jobs).toEqual([]);
    expect(again.skipped.find((s) => s.figureId === draftId)?.reason).toBe(`already has the colours of swatchbook "Red and green ${RUN_ID}" v2`);
    expect((await stored()).versions).toBe(versions);
    expect((await audit(draftId)).filter((e) => e.action === 'colour_override')).toHaveLength(2); // the pin's and the first batch's
  });

  it('pinning a passing swatchbook needs no reason, clears the override and re-renders without one', async () => {
    const h = (await put(`/api/publications/${pubId}/house-style`, tok.artDirector, { swatchbookId: passing }).expect(200)).body as HouseStyleDto;
    expect(h.colourOverride).toBeNull();
    expect((await subjectAudit())[0]).toMatchObject({ action: 'house_style_pin', note: `pinned swatchbook "Brick and slate ${RUN_ID}" v1 (colour checks pass)` });
    const batch = (await post(`/api/publications/${pubId}/rerender`, tok.artDirector).expect(201)).body as BatchDto;
    expect(batch.overrideReason).toBeNull();
  });
});
