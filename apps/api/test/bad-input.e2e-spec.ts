import { ListMultipartUploadsCommand, S3Client } from '@aws-sdk/client-s3';
import { ObjectStorage } from '@psiform/server';
import { auth, demoTokens, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp } from './support';

/**
 * Bad input over every route (issue "Stays up and stays scoped", rule 5 of the brief): each case must answer the
 * stated 4xx with a message naming the field, leave every table (and the stored objects) as they were, and leave
 * the API alive. The last test walks every route the app has (new ones included) with the generic kinds of bad
 * input and asserts no answer is a 5xx.
 */
type Who = 'illustrator' | 'editor' | 'artDirector' | 'admin' | 'none';
interface Case {
  name: string;
  as: Who;
  method: 'get' | 'post' | 'patch' | 'put';
  path: string;
  /** JSON body (sent as is), or raw text with its content type. */
  body?: unknown;
  raw?: { text: string | Buffer; type: string };
  /** multipart parts in order: [name, value] fields, or [name, Buffer, filename] files. */
  multipart?: Array<[string, string] | [string, Buffer, string]>;
  status: number;
  /** Must match the JSON of the answer's message: the field is named. */
  field: RegExp;
}

const TABLES = ['users', 'publications', 'publication_members', 'figures', 'figure_versions', 'assets', 'jobs', 'swatchbooks', 'swatchbook_versions', 'house_styles', 'comments', 'review_rounds', 'audit_entries', 'figure_sets', 'batches'];

const deep = (levels: number, leaf: unknown = 1): unknown => {
  let v = leaf;
  for (let i = 0; i < levels; i++) v = [v];
  return v;
};
const deepText = (key: string, levels: number) => `{"${key}":${'['.repeat(levels)}${']'.repeat(levels)}}`;
const NUL = 'a\u0000b';
const LONE = 'x\ud800y';
const CTRL = 'bell\u0007';
const recipe = (over: Record<string, unknown> = {}) => smallRecipe(over);
const withStage = (material: Record<string, unknown>) => recipe({ stage: { material } });

/** A multipart body by hand (so parts can repeat, come out of order, or stop mid-part). */
function multipartBody(parts: Array<[string, string] | [string, Buffer, string]>, { cutInLastPart = false } = {}): { body: Buffer; type: string } {
  const b = `----psiform${RUN_ID}`;
  const chunks: Buffer[] = [];
  parts.forEach((p, i) => {
    const last = i === parts.length - 1;
    if (p.length === 2) chunks.push(Buffer.from(`--${b}\r\nContent-Disposition: form-data; name="${p[0]}"\r\n\r\n${p[1]}\r\n`));
    else {
      chunks.push(Buffer.from(`--${b}\r\nContent-Disposition: form-data; name="${p[0]}"; filename="${p[2]}"\r\nContent-Type: application/octet-stream\r\n\r\n`), p[1]);
      if (!(last && cutInLastPart)) chunks.push(Buffer.from('\r\n'));
    }
  });
  if (!cutInLastPart) chunks.push(Buffer.from(`--${b}--\r\n`));
  return { body: Buffer.concat(chunks), type: `multipart/form-data; boundary=${b}` };
}

/** A tiny valid NRRD cube (2×2×2 float32 little endian). */
const nrrd = Buffer.concat([Buffer.from('NRRD0004\ntype: float\ndimension: 3\nsizes: 2 2 2\nspacings: 1 1 1\nencoding: raw\nendian: little\n\n'), Buffer.from(new Float32Array([1, -1, 0.5, -0.5, 0.25, -0.25, 0.1, -0.1]).buffer)]);

describe('bad input on every route: 4xx naming the field, nothing stored, still alive (e2e)', () => {
  let t: TestApp;
  let tok: Record<Exclude<Who, 'none'>, string>;
  let storage: ObjectStorage;
  let figure: string;
  let book: string;
  let set: string;
  const pub = DEMO_PUBLICATION.id;
  const NIL = '00000000-0000-4000-8000-000000000000';

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
    storage = t.app.get(ObjectStorage);

    figure = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Bad input target ${RUN_ID}`, recipe: recipe() }).expect(201)).body.id;
    book = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: `Bad input book ${RUN_ID}`, publicationId: pub, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }).expect(201)).body.id;
    set = (await t.http().post('/api/figure-sets').set(auth(tok.editor)).send({ publicationId: pub, title: `Bad input set ${RUN_ID}`, figureIds: [figure], columns: 1 }).expect(201)).body.id;
  }, 60_000);

  afterAll(async () => {
    if (!t) return;
    await t.ds.query(`DELETE FROM figure_sets WHERE title LIKE $1`, [`%${RUN_ID}%`]);
    await t.ds.query(`DELETE FROM swatchbooks WHERE name LIKE $1`, [`%${RUN_ID}%`]);
    await t.close();
  });

  const snapshot = async () => {
    const counts = (await t.ds.query(`SELECT ${TABLES.map((tb) => `(SELECT count(*)::int FROM "${tb}") AS "${tb}"`).join(', ')}`))[0];
    const figureRow = (await t.ds.query(`SELECT title, status, current_version FROM figures WHERE id = $1`, [figure]))[0];
    const bookRow = (await t.ds.query(`SELECT name, version, locked FROM swatchbooks WHERE id = $1`, [book]))[0];
    return { counts, figureRow, bookRow, objects: (await storage.list('')).length };
  };

  const fill = (s: string) => s.replaceAll('{F}', figure).replaceAll('{B}', book).replaceAll('{S}', set);
  const send = (k: Case) => {
    const c = { ...k, path: fill(k.path), body: k.body === undefined ? undefined : JSON.parse(fill(JSON.stringify(k.body))) };
    let r = t.http()[c.method](c.path);
    if (c.as !== 'none') r = r.set(auth(tok[c.as]));
    if (c.multipart) {
      const m = multipartBody(c.multipart);
      return r.set('Content-Type', m.type).send(m.body);
    }
    if (c.raw) return r.set('Content-Type', c.raw.type).send(c.raw.text);
    return c.body === undefined ? r : r.send(c.body as object);
  };

  // Ids made in beforeAll are not known when the cases are listed: {F}, {B} and {S} stand for them until sent.
  const F = () => '/api/figures/{F}';
  const cases = (): Case[] => {
    const c = (name: string, as: Who, method: Case['method'], path: string, body: unknown, status: number, field: RegExp): Case => ({ name, as, method, path, body, status, field });
    const raw = (name: string, as: Who, method: Case['method'], path: string, text: string | Buffer, type: string, status: number, field: RegExp): Case => ({ name, as, method, path, raw: { text, type }, status, field });
    const up = (name: string, parts: Case['multipart'], status: number, field: RegExp): Case => ({ name, as: 'illustrator', method: 'post', path: '/api/uploads', multipart: parts, status, field });
    const okFields: Array<[string, string]> = [['publicationId', pub], ['title', `Upload ${RUN_ID}`], ['format', 'nrrd']];
    const L = '/api/auth/login';
    return [
      // ---- sign-in
      c('login: email missing', 'none', 'post', L, { password: 'x' }, 400, /email/),
      c('login: email null', 'none', 'post', L, { email: null, password: 'x' }, 400, /email/),
      c('login: email a number', 'none', 'post', L, { email: 42, password: 'x' }, 400, /email/),
      c('login: password an object', 'none', 'post', L, { email: 'a@b.test', password: { $gt: '' } }, 400, /password/),
      c('login: NUL in email', 'none', 'post', L, { email: `a${NUL}@b.test`, password: 'x' }, 400, /email: must not contain NUL/),
      c('login: lone surrogate in password', 'none', 'post', L, { email: 'a@b.test', password: LONE }, 400, /password: must be valid Unicode/),
      c('login: unknown field', 'none', 'post', L, { email: 'a@b.test', password: 'x', admin: true }, 400, /admin/),
      c('login: body an array', 'none', 'post', L, [{ email: 'a@b.test' }], 400, /body: must be a JSON object/),
      raw('login: malformed JSON', 'none', 'post', L, '{"email":', 'application/json', 400, /body: not valid JSON/),
      raw('login: JSON nested 15,000 levels', 'none', 'post', L, deepText('email', 15000), 'application/json', 400, /body: nested deeper than/),
      raw('login: body over 1 MB', 'none', 'post', L, JSON.stringify({ email: 'a@b.test', password: 'x'.repeat(1_100_000) }), 'application/json', 413, /body: larger than/),
      raw('login: unsupported charset', 'none', 'post', L, '{}', 'application/json; charset=koi8-r', 415, /body: unsupported charset/),
      c('login: email over 320 characters', 'none', 'post', L, { email: `${'a'.repeat(330)}@b.test`, password: 'x' }, 400, /email/),
      c('login: password key __proto__', 'none', 'post', L, JSON.parse('{"email":"a@b.test","password":"x","__proto__":{"role":"admin"}}'), 400, /__proto__: field name not allowed/),
      // ---- users (admin)
      c('users: displayName null', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: null, password: 'long-enough-1', role: 'editor' }, 400, /displayName/),
      c('users: NUL in displayName', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: NUL, password: 'long-enough-1', role: 'editor' }, 400, /displayName: must not contain NUL/),
      c('users: lone surrogate in displayName', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: LONE, password: 'long-enough-1', role: 'editor' }, 400, /displayName: must be valid Unicode/),
      c('users: control character in displayName', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: CTRL, password: 'long-enough-1', role: 'editor' }, 400, /displayName: must not contain control/),
      c('users: not an email', 'admin', 'post', '/api/users', { email: 'nobody', displayName: 'N', password: 'long-enough-1', role: 'editor' }, 400, /email/),
      c('users: password too short', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'N', password: 'short', role: 'editor' }, 400, /password/),
      c('users: password over 72 bytes (multi-byte)', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'N', password: 'é'.repeat(40), role: 'editor' }, 400, /password must be at most 72 bytes/),
      c('users: unknown role', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'N', password: 'long-enough-1', role: 'owner' }, 400, /role/),
      c('users: role null', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'N', password: 'long-enough-1', role: null }, 400, /role/),
      c('users: unknown field', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'N', password: 'long-enough-1', role: 'editor', isAdmin: true }, 400, /isAdmin/),
      c('users: displayName over 120 characters', 'admin', 'post', '/api/users', { email: `u-${RUN_ID}@e2e.psiform.test`, displayName: 'n'.repeat(121), password: 'long-enough-1', role: 'editor' }, 400, /displayName/),
      // ---- publications (admin)
      c('publications: title null', 'admin', 'post', '/api/publications', { title: null, publisher: 'P', kind: 'book' }, 400, /title/),
      c('publications: NUL in title', 'admin', 'post', '/api/publications', { title: NUL, publisher: 'P', kind: 'book' }, 400, /title: must not contain NUL/),
      c('publications: lone surrogate in publisher', 'admin', 'post', '/api/publications', { title: 'T', publisher: LONE, kind: 'book' }, 400, /publisher: must be valid Unicode/),
      c('publications: unknown kind', 'admin', 'post', '/api/publications', { title: 'T', publisher: 'P', kind: 'magazine' }, 400, /kind/),
      c('publications: description null', 'admin', 'post', '/api/publications', { title: 'T', publisher: 'P', kind: 'book', description: null }, 400, /description must not be null/),
      c('publications: title over 300 characters', 'admin', 'post', '/api/publications', { title: 't'.repeat(301), publisher: 'P', kind: 'book' }, 400, /title/),
      c('publications: unknown field', 'admin', 'post', '/api/publications', { title: 'T', publisher: 'P', kind: 'book', owner: 'me' }, 400, /owner/),
      c('publications: whitespace-only title', 'admin', 'post', '/api/publications', { title: '   ', publisher: 'P', kind: 'book' }, 400, /title must not be empty/),
      c('members: userId not a UUID', 'admin', 'post', `/api/publications/${pub}/members`, { userId: 'me' }, 400, /userId/),
      c('members: userId null', 'admin', 'post', `/api/publications/${pub}/members`, { userId: null }, 400, /userId/),
      c('members: publication id not a UUID', 'admin', 'post', '/api/publications/book-1/members', { userId: NIL }, 400, /id must be a UUID/),
      c('publication: NUL in the id', 'admin', 'get', '/api/publications/%00', undefined, 400, /id: must not contain NUL/),
      // ---- figures: create
      c('figures: recipe missing', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}` }, 400, /recipe is required/),
      c('figures: recipe null', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: null }, 400, /recipe/),
      c('figures: recipe an array', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: [] }, 400, /recipe/),
      c('figures: title null', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: null, recipe: recipe() }, 400, /title/),
      c('figures: NUL in title', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: NUL, recipe: recipe() }, 400, /title: must not contain NUL/),
      c('figures: lone surrogate in recipe.label', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ label: LONE }) }, 400, /recipe\.label: must be valid Unicode/),
      c('figures: NUL in recipe.annotations.caption', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ annotations: { caption: NUL } }) }, 400, /recipe\.annotations\.caption: must not contain NUL/),
      c('figures: recipe nested 40 levels', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ label: deep(40) }) }, 400, /nested deeper than/),
      raw('figures: recipe nested 15,000 levels (raw text)', 'illustrator', 'post', '/api/figures', deepText('recipe', 15000), 'application/json', 400, /body: nested deeper than/),
      c('figures: misspelt nested field (nodalOutLine)', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: withStage({ nodalOutLine: true }) }, 400, /recipe\.stage\.material\.nodalOutLine: unknown field/),
      c('figures: unknown recipe top-level field', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ colour: 'red' }) }, 400, /recipe\.colour: unknown field/),
      c('figures: unknown field in a term', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, spin: 1 }] } }) }, 400, /recipe\.content\.terms\.0\.spin: unknown field/),
      c('figures: unknown top-level field', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe(), ownerId: NIL }, 400, /ownerId/),
      c('figures: publicationId not a UUID', 'illustrator', 'post', '/api/figures', { publicationId: 'demo', title: `T ${RUN_ID}`, recipe: recipe() }, 400, /publicationId/),
      c('figures: publicationId null', 'illustrator', 'post', '/api/figures', { publicationId: null, title: `T ${RUN_ID}`, recipe: recipe() }, 400, /publicationId/),
      c('figures: n = 0', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: [{ n: 0, l: 0, m: 0, basis: 'real', re: 1 }] } }) }, 400, /recipe\.content\.terms\.0\.n/),
      c('figures: l = n', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: [{ n: 2, l: 2, m: 0, basis: 'real', re: 1 }] } }) }, 400, /recipe\.content\.terms\.0\.l/),
      c('figures: |m| > l', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: [{ n: 3, l: 1, m: 2, basis: 'real', re: 1 }] } }) }, 400, /recipe\.content\.terms\.0\.m/),
      c('figures: grid 100000', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ grid: { n: 100000 } }) }, 400, /recipe\.grid\.n/),
      c('figures: fraction 1.5', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ surface: { rule: 'enclosed', fraction: 1.5 } }) }, 400, /recipe\.surface\.fraction/),
      c('figures: fraction as a string', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ surface: { rule: 'enclosed', fraction: '0.9' } }) }, 400, /recipe\.surface\.fraction/),
      c('figures: Z = 0', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 0, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 1 }] } }) }, 400, /recipe\.content\.Z/),
      c('figures: no terms', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: [] } }) }, 400, /recipe\.content\.terms/),
      c('figures: 17 terms', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ content: { Z: 1, terms: Array.from({ length: 17 }, () => ({ n: 1, l: 0, m: 0, basis: 'real', re: 1 })) } }) }, 400, /recipe\.content\.terms/),
      c('figures: recipe version 2', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ version: 2 }) }, 400, /recipe\.version/),
      c('figures: bad palette colour', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ palette: { positive: 'crimson' } }) }, 400, /recipe\.palette\.positive/),
      c('figures: dpi 301', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ canvas: { widthMm: 89, heightMm: 60, dpi: 301 } }) }, 400, /recipe\.canvas\.dpi/),
      c('figures: caption over 2000 characters', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ annotations: { caption: 'c'.repeat(2001) } }) }, 400, /recipe\.annotations\.caption/),
      c('figures: a swatchbook that does not exist', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: `T ${RUN_ID}`, recipe: recipe({ palette: { swatchbookId: NIL } }) }, 400, /recipe\.palette\.swatchbookId/),
      c('figures: title over 200 characters', 'illustrator', 'post', '/api/figures', { publicationId: pub, title: 't'.repeat(201), recipe: recipe() }, 400, /title/),
      raw('figures: text/plain body', 'illustrator', 'post', '/api/figures', 'title=x', 'text/plain', 400, /publicationId|title|recipe/),
      // ---- figures: list
      ...[
        ['1e20', 'page=100000000000000000000'],
        ['0', 'page=0'],
        ['-1', 'page=-1'],
        ['1.5', 'page=1.5'],
        ['abc', 'page=abc'],
        ['1e400 (Infinity)', 'page=1e400'],
        ['twice', 'page=1&page=2'],
      ].map(([name, query]) => c(`list: page ${name}`, 'illustrator', 'get', `/api/figures?${query}`, undefined, 400, /page/)),
      c('list: pageSize 101', 'illustrator', 'get', '/api/figures?pageSize=101', undefined, 400, /pageSize/),
      c('list: pageSize 0', 'illustrator', 'get', '/api/figures?pageSize=0', undefined, 400, /pageSize/),
      c('list: unknown sort', 'illustrator', 'get', '/api/figures?sort=owner_id', undefined, 400, /sort/),
      c('list: unknown order', 'illustrator', 'get', '/api/figures?order=sideways', undefined, 400, /order/),
      c('list: unknown status', 'illustrator', 'get', '/api/figures?status=lost', undefined, 400, /status/),
      c('list: NUL in q', 'illustrator', 'get', '/api/figures?q=%00', undefined, 400, /q: must not contain NUL/),
      c('list: control character in q', 'illustrator', 'get', '/api/figures?q=%07', undefined, 400, /q: must not contain control/),
      c('list: q over 200 characters', 'illustrator', 'get', `/api/figures?q=${'q'.repeat(201)}`, undefined, 400, /q must be at most/),
      c('list: q as an object', 'illustrator', 'get', '/api/figures?q[a]=1', undefined, 400, /q/),
      c('list: publicationId not a UUID', 'illustrator', 'get', '/api/figures?publicationId=demo', undefined, 400, /publicationId/),
      c('list: unknown query field', 'illustrator', 'get', '/api/figures?owner=me', undefined, 400, /owner/),
      // ---- figures: one figure
      c('figure: id not a UUID', 'illustrator', 'get', '/api/figures/figure-1', undefined, 400, /id must be a UUID/),
      c('figure: NUL in the id', 'illustrator', 'get', '/api/figures/%00', undefined, 400, /id: must not contain NUL/),
      c('figure: broken percent-encoding in the id', 'illustrator', 'get', '/api/figures/%E0%A4%A', undefined, 400, /param|id/),
      c('PATCH: title null', 'illustrator', 'patch', F(), { title: null }, 400, /title must not be null/),
      c('PATCH: recipe null', 'illustrator', 'patch', F(), { recipe: null }, 400, /recipe must not be null/),
      c('PATCH: NUL in title', 'illustrator', 'patch', F(), { title: NUL }, 400, /title: must not contain NUL/),
      c('PATCH: lone surrogate in title', 'illustrator', 'patch', F(), { title: LONE }, 400, /title: must be valid Unicode/),
      c('PATCH: empty title', 'illustrator', 'patch', F(), { title: '' }, 400, /title must not be empty/),
      c('PATCH: title a number', 'illustrator', 'patch', F(), { title: 7 }, 400, /title must be a string/),
      c('PATCH: unknown field', 'illustrator', 'patch', F(), { status: 'approved' }, 400, /status/),
      c('PATCH: misspelt nested recipe field', 'illustrator', 'patch', F(), { recipe: withStage({ nodalOutLine: true }) }, 400, /recipe\.stage\.material\.nodalOutLine: unknown field/),
      c('PATCH: lone surrogate in recipe.label', 'illustrator', 'patch', F(), { recipe: recipe({ label: LONE }) }, 400, /recipe\.label/),
      raw('PATCH: recipe nested 15,000 levels', 'illustrator', 'patch', F(), deepText('recipe', 15000), 'application/json', 400, /body: nested deeper than/),
      c('PATCH: body an array', 'illustrator', 'patch', F(), [{ title: 'x' }], 400, /body: must be a JSON object/),
      raw('PATCH: a bare JSON string', 'illustrator', 'patch', F(), '"title"', 'application/json', 400, /body/),
      raw('PATCH: malformed JSON', 'illustrator', 'patch', F(), '{"title": }', 'application/json', 400, /body: not valid JSON/),
      c('PATCH: key __proto__ inside the recipe', 'illustrator', 'patch', F(), { recipe: JSON.parse('{"__proto__":{"polluted":true}}') }, 400, /recipe\.__proto__: field name not allowed/),
      c('PATCH: key constructor', 'illustrator', 'patch', F(), { constructor: { prototype: {} } }, 400, /constructor: field name not allowed/),
      c('mesh: id not a UUID', 'illustrator', 'post', '/api/figures/x/meshes', undefined, 400, /id must be a UUID/),
      c('audit: id not a UUID', 'editor', 'get', '/api/figures/x/audit', undefined, 400, /id must be a UUID/),
      // ---- exports
      c('export: format missing', 'illustrator', 'post', `${F()}/exports`, {}, 400, /format/),
      c('export: unknown format', 'illustrator', 'post', `${F()}/exports`, { format: 'bmp' }, 400, /format/),
      c('export: widthMm 5', 'illustrator', 'post', `${F()}/exports`, { format: 'png', widthMm: 5, heightMm: 60, dpi: 300 }, 400, /widthMm/),
      c('export: dpi 301', 'illustrator', 'post', `${F()}/exports`, { format: 'png', widthMm: 89, heightMm: 60, dpi: 301 }, 400, /dpi/),
      c('export: transparent "yes"', 'illustrator', 'post', `${F()}/exports`, { format: 'png', widthMm: 89, heightMm: 60, dpi: 300, transparent: 'yes' }, 400, /transparent/),
      c('export: unknown field', 'illustrator', 'post', `${F()}/exports`, { format: 'glb', scale: 2 }, 400, /scale/),
      c('export: NUL in format', 'illustrator', 'post', `${F()}/exports`, { format: `png${NUL}` }, 400, /format: must not contain NUL/),
      c('export: raster over the pixel cap', 'illustrator', 'post', `${F()}/exports`, { format: 'png', widthMm: 1000, heightMm: 1000, dpi: 1200 }, 400, /dpi/),
      c('export: unknown svg kind', 'illustrator', 'post', `${F()}/exports`, { format: 'svg', kind: 'pie' }, 400, /kind/),
      c('export: widthMm null', 'illustrator', 'post', `${F()}/exports`, { format: 'png', widthMm: null, heightMm: 60, dpi: 300 }, 400, /widthMm/),
      c('export: body an array', 'illustrator', 'post', `${F()}/exports`, [1], 400, /body/),
      // ---- figure sets
      c('set: figureIds empty', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: [], columns: 1 }, 400, /figureIds/),
      c('set: 13 figures', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: Array.from({ length: 13 }, () => '{F}'), columns: 1 }, 400, /figureIds/),
      c('set: a figure twice', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: ['{F}', '{F}'], columns: 1 }, 400, /figureIds/),
      c('set: a figure id not a UUID', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: ['f1'], columns: 1 }, 400, /figureIds\.0/),
      c('set: a figure of nowhere', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: [NIL], columns: 1 }, 400, /figureIds\.0/),
      c('set: columns 7', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: ['{F}'], columns: 7 }, 400, /columns/),
      c('set: NUL in title', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: NUL, figureIds: ['{F}'], columns: 1 }, 400, /title: must not contain NUL/),
      c('set: title null', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: null, figureIds: ['{F}'], columns: 1 }, 400, /title/),
      c('set: unknown field', 'editor', 'post', '/api/figure-sets', { publicationId: pub, title: 'S', figureIds: ['{F}'], columns: 1, layout: 'grid' }, 400, /layout/),
      c('set: publicationId null', 'editor', 'post', '/api/figure-sets', { publicationId: null, title: 'S', figureIds: ['{F}'], columns: 1 }, 400, /publicationId/),
      c('sets: list without publicationId', 'editor', 'get', '/api/figure-sets', undefined, 400, /publicationId/),
      c('sets: list with NUL publicationId', 'editor', 'get', '/api/figure-sets?publicationId=%00', undefined, 400, /publicationId/),
      c('set export: svg is not offered', 'editor', 'post', `/api/figure-sets/{S}/exports`, { format: 'svg', kind: 'radial' }, 400, /format/),
      c('set export: dpi 72', 'editor', 'post', `/api/figure-sets/{S}/exports`, { format: 'png', widthMm: 80, heightMm: 60, dpi: 72 }, 400, /dpi/),
      // ---- reviews
      c('request changes: note missing', 'editor', 'post', `${F()}/request-changes`, {}, 400, /note/),
      c('request changes: note null', 'editor', 'post', `${F()}/request-changes`, { note: null }, 400, /note/),
      c('request changes: NUL in note', 'editor', 'post', `${F()}/request-changes`, { note: NUL }, 400, /note: must not contain NUL/),
      c('request changes: note over 2000 characters', 'editor', 'post', `${F()}/request-changes`, { note: 'n'.repeat(2001) }, 400, /note/),
      c('approve: note null', 'editor', 'post', `${F()}/approve`, { note: null }, 400, /note must not be null/),
      c('approve: note a number', 'editor', 'post', `${F()}/approve`, { note: 5 }, 400, /note must be a string/),
      c('colour sign-off: unknown field', 'artDirector', 'post', `${F()}/colour-signoff`, { force: true }, 400, /force/),
      c('comment: body missing', 'editor', 'post', `${F()}/comments`, {}, 400, /body/),
      c('comment: body null', 'editor', 'post', `${F()}/comments`, { body: null }, 400, /body/),
      c('comment: NUL in body', 'editor', 'post', `${F()}/comments`, { body: NUL }, 400, /body: must not contain NUL/),
      c('comment: lone surrogate in body', 'editor', 'post', `${F()}/comments`, { body: LONE }, 400, /body: must be valid Unicode/),
      c('comment: whitespace only', 'editor', 'post', `${F()}/comments`, { body: '   ' }, 400, /body must not be empty/),
      c('comment: over 4000 characters', 'editor', 'post', `${F()}/comments`, { body: 'b'.repeat(4001) }, 400, /body/),
      c('comment: pin x = 2', 'editor', 'post', `${F()}/comments`, { body: 'here', pin: { x: 2, y: 0.5 } }, 400, /x must be a number from 0 to 1/),
      c('comment: pin null', 'editor', 'post', `${F()}/comments`, { body: 'here', pin: null }, 400, /pin must not be null/),
      c('comment: versionId not a UUID', 'editor', 'post', `${F()}/comments`, { body: 'here', versionId: 'v1' }, 400, /versionId/),
      c('comment: unknown pin field', 'editor', 'post', `${F()}/comments`, { body: 'here', pin: { x: 0.5, y: 0.5, z: 1 } }, 400, /z/),
      c('comment: unknown field', 'editor', 'post', `${F()}/comments`, { body: 'here', author: 'someone' }, 400, /author/),
      // ---- swatchbooks
      c('swatchbook: name null', 'artDirector', 'post', '/api/swatchbooks', { name: null, publicationId: pub, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }, 400, /name/),
      c('swatchbook: NUL in name', 'artDirector', 'post', '/api/swatchbooks', { name: NUL, publicationId: pub, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }, 400, /name: must not contain NUL/),
      c('swatchbook: lone surrogate in name', 'artDirector', 'post', '/api/swatchbooks', { name: LONE, publicationId: pub, colors: {} }, 400, /name: must be valid Unicode/),
      c('swatchbook: colors null', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: pub, colors: null }, 400, /colors/),
      c('swatchbook: a colour word', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: pub, colors: { positive: 'crimson', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }, 400, /colors\.positive/),
      c('swatchbook: an unknown swatch', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: pub, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a', glow: '#ffffff' } }, 400, /colors\.glow/),
      c('swatchbook: no publication', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }, 400, /publicationId/),
      c('swatchbook: publicationId null', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: null, colors: {} }, 400, /publicationId/),
      c('swatchbook: publication and publisher both', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: pub, publisher: 'P', colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' } }, 400, /publicationId/),
      c('swatchbook: NUL in publisher', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publisher: NUL, colors: {} }, 400, /publisher: must not contain NUL/),
      c('swatchbook: wheel chroma 2', 'artDirector', 'post', '/api/swatchbooks', { name: 'N', publicationId: pub, colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a', wheel: { lightness: 0.7, chroma: 2 } } }, 400, /colors\.wheel\.chroma/),
      c('swatchbook PATCH: name null', 'artDirector', 'patch', `/api/swatchbooks/{B}`, { name: null }, 400, /name must not be null/),
      c('swatchbook PATCH: colors an array', 'artDirector', 'patch', `/api/swatchbooks/{B}`, { colors: [] }, 400, /colors/),
      c('swatchbook PATCH: nothing to change', 'artDirector', 'patch', `/api/swatchbooks/{B}`, {}, 400, /name or colors/),
      c('swatchbook PATCH: unknown field', 'artDirector', 'patch', `/api/swatchbooks/{B}`, { locked: true }, 400, /locked/),
      c('swatchbook PATCH: control character in name', 'artDirector', 'patch', `/api/swatchbooks/{B}`, { name: CTRL }, 400, /name: must not contain control/),
      c('swatchbook: id not a UUID', 'artDirector', 'get', '/api/swatchbooks/house', undefined, 400, /id must be a UUID/),
      c('swatchbooks: list with a bad publicationId', 'artDirector', 'get', '/api/swatchbooks?publicationId=p1', undefined, 400, /publicationId/),
      c('import: formatVersion 7', 'artDirector', 'post', '/api/swatchbooks/import', { format: 'psiform-swatchbook', formatVersion: 7, name: 'N', colors: {}, publicationId: pub }, 400, /formatVersion/),
      c('import: format missing', 'artDirector', 'post', '/api/swatchbooks/import', { formatVersion: 1, name: 'N', colors: {}, publicationId: pub }, 400, /format/),
      c('import: unknown field', 'artDirector', 'post', '/api/swatchbooks/import', { format: 'psiform-swatchbook', formatVersion: 1, name: 'N', colors: {}, publicationId: pub, owner: 'x' }, 400, /owner/),
      c('house style: swatchbookId null', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: null }, 400, /swatchbookId/),
      c('house style: allowOverride "yes"', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: '{B}', allowOverride: 'yes' }, 400, /allowOverride/),
      c('house style: a swatchbook that does not exist', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: NIL }, 400, /swatchbookId/),
      c('house style: unknown field', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: '{B}', colours: 'all' }, 400, /colours/),
      c('rerender: publication id not a UUID', 'artDirector', 'post', '/api/publications/p/rerender', undefined, 400, /id must be a UUID/),
      c('house style: override a string', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: '{B}', override: 'yes' }, 400, /override must be an object/),
      c('house style: override reason too short', 'artDirector', 'put', `/api/publications/${pub}/house-style`, { swatchbookId: '{B}', override: { reason: 'ok' } }, 400, /override\.reason: at least 10/),
      c('rerender: override an array', 'artDirector', 'post', `/api/publications/${pub}/rerender`, { override: ['a reason long enough'] }, 400, /override must be an object/),
      c('house-style impact: for missing', 'artDirector', 'get', `/api/publications/${pub}/house-style/impact`, undefined, 400, /for must be one of pin, rerender/),
      c('house-style impact: swatchbookId not a UUID', 'artDirector', 'get', `/api/publications/${pub}/house-style/impact?for=pin&swatchbookId=red`, undefined, 400, /swatchbookId must be a UUID/),
      c('batch: id not a UUID', 'artDirector', 'get', '/api/batches/b1', undefined, 400, /id must be a UUID/),
      // ---- jobs and assets
      c('job: id not a UUID', 'illustrator', 'get', '/api/jobs/j1', undefined, 400, /id must be a UUID/),
      c('job events: id not a UUID', 'illustrator', 'get', '/api/jobs/j1/events', undefined, 400, /id must be a UUID/),
      c('asset link: id not a UUID', 'illustrator', 'get', '/api/assets/a1/link', undefined, 400, /id must be a UUID/),
      c('asset download: NUL in the id', 'illustrator', 'get', '/api/assets/%00/download', undefined, 400, /id: must not contain NUL/),
      // ---- uploads (multipart)
      raw('upload: not multipart', 'illustrator', 'post', '/api/uploads', '{}', 'application/json', 400, /multipart/),
      up('upload: cube missing', okFields, 400, /cube/),
      up('upload: two cube parts (refused before storing anything)', [...okFields, ['cube', nrrd, 'a.nrrd'], ['cube', nrrd, 'b.nrrd']], 400, /cube: part given twice/),
      up('upload: title given twice', [['publicationId', pub], ['title', 'A'], ['title', 'B'], ['format', 'nrrd'], ['cube', nrrd, 'c.nrrd']], 400, /title: part given twice/),
      up('upload: NUL in title', [['publicationId', pub], ['title', NUL], ['format', 'nrrd'], ['cube', nrrd, 'c.nrrd']], 400, /title: must not contain NUL/),
      up('upload: control character in title', [['publicationId', pub], ['title', CTRL], ['format', 'nrrd'], ['cube', nrrd, 'c.nrrd']], 400, /title: must not contain control/),
      up('upload: unknown format', [['publicationId', pub], ['title', 'T'], ['format', 'vtk'], ['cube', nrrd, 'c.nrrd']], 400, /format/),
      up('upload: fraction 2', [...okFields, ['fraction', '2'], ['cube', nrrd, 'c.nrrd']], 400, /fraction/),
      up('upload: publicationId not a UUID', [['publicationId', 'p1'], ['title', 'T'], ['format', 'nrrd'], ['cube', nrrd, 'c.nrrd']], 400, /publicationId/),
      up('upload: raw without a sidecar', [['publicationId', pub], ['title', 'T'], ['format', 'raw'], ['cube', Buffer.alloc(32), 'c.raw']], 400, /sidecar/),
      up('upload: sidecar not JSON', [['publicationId', pub], ['title', 'T'], ['format', 'raw'], ['sidecar', Buffer.from('{sizes'), 's.json'], ['cube', Buffer.alloc(32), 'c.raw']], 400, /sidecar/),
      up('upload: sidecar nested 20,000 levels', [['publicationId', pub], ['title', 'T'], ['format', 'raw'], ['sidecar', Buffer.from('['.repeat(20000) + ']'.repeat(20000)), 's.json'], ['cube', Buffer.alloc(32), 'c.raw']], 400, /sidecar/),
      up('upload: an unexpected file part', [...okFields, ['photo', Buffer.from('x'), 'p.png'], ['cube', nrrd, 'c.nrrd']], 400, /photo/),
      up('upload: field after the cube', [...okFields, ['cube', nrrd, 'c.nrrd'], ['quantity', 'psi']], 400, /quantity/),
      up('upload: quantity unknown', [...okFields, ['quantity', 'spin'], ['cube', nrrd, 'c.nrrd']], 400, /quantity/),
      up('upload: cube that is not NRRD', [...okFields, ['cube', Buffer.from('hello world, not a cube'), 'c.nrrd']], 400, /cube/),
    ];
  };

  it('has at least 130 cases', () => {
    expect(cases().length).toBeGreaterThanOrEqual(130);
  });

  it.each(cases().map((k) => [k.name, k] as const))('%s', async (_name, k) => {
    const before = await snapshot();
    const res = await send(k);
    expect({ status: res.status, body: res.body }).toMatchObject({ status: k.status });
    expect(JSON.stringify(res.body?.message)).toMatch(k.field);
    expect(await snapshot()).toEqual(before);
    await t.http().get('/api/health').expect(200);
  });

  it('a multipart upload cut off inside the cube part (correct Content-Length) answers 400 and the API stays up', async () => {
    const before = await snapshot();
    const m = multipartBody([['publicationId', pub], ['title', `Cut ${RUN_ID}`], ['format', 'nrrd'], ['cube', nrrd.subarray(0, 60), 'c.nrrd']], { cutInLastPart: true });
    const res = await t.http().post('/api/uploads').set(auth(tok.illustrator)).set('Content-Type', m.type).send(m.body);
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body.message)).toMatch(/cube|multipart/);
    expect(await snapshot()).toEqual(before);
    await t.http().get('/api/health').expect(200);
  });

  it('every route of the app (new ones too) answers the generic kinds of bad input with 4xx, never 5xx', async () => {
    const router = (t.app.getHttpAdapter().getInstance() as { router: { stack: Array<{ route?: { path: string; methods: Record<string, boolean> } }> } }).router;
    const routes = router.stack.filter((l) => l.route).flatMap((l) => Object.keys(l.route!.methods).map((m) => ({ method: m, path: l.route!.path })));
    expect(routes.length).toBeGreaterThan(40);
    const generic: Array<{ what: string; fill: string; body?: unknown; raw?: string }> = [
      { what: 'NUL in every parameter', fill: '%00', body: { title: NUL } },
      { what: 'a lone surrogate in every body string', fill: NIL, body: { title: LONE, name: LONE, note: LONE, body: LONE, recipe: { label: LONE } } },
      { what: 'a body nested 10,000 levels', fill: NIL, raw: deepText('x', 10000) },
      { what: 'nulls for every common field', fill: NIL, body: { title: null, recipe: null, name: null, colors: null, note: null, body: null, publicationId: null, email: null, password: null, swatchbookId: null, userId: null, format: null } },
      { what: 'a body that is an array', fill: NIL, body: [1, 2, 3] },
    ];
    const fives: string[] = [];
    const before = await snapshot();
    for (const r of routes) {
      if (r.method === 'get' && /events$/.test(r.path)) continue; // an event stream stays open: its id is checked by the cases above
      for (const g of generic) {
        const path = r.path.replace(/:[A-Za-z]+/g, g.fill);
        for (const who of ['admin', 'illustrator'] as const) {
          let req = (t.http() as unknown as Record<string, (p: string) => ReturnType<ReturnType<TestApp['http']>['get']>>)[r.method](path).set(auth(tok[who]));
          req = g.raw ? req.set('Content-Type', 'application/json').send(g.raw) : g.body === undefined ? req : req.send(g.body as object);
          const res = await req;
          if (res.status >= 500) fives.push(`${r.method.toUpperCase()} ${path} (${g.what}, ${who}): ${res.status} ${JSON.stringify(res.body)}`);
        }
      }
    }
    expect(fives).toEqual([]);
    expect(await snapshot()).toEqual(before);
    await t.http().get('/api/health').expect(200);
  }, 300_000);
  // Last: a second app in this process re-registers the passport 'jwt' strategy, which the first app then shares.
  it('an oversize upload (multipart to storage) answers 413 and leaves no parts in the storage fake', async () => {
    const small = await startTestApp({ UPLOAD_MAX_BYTES: String(12 * 1024 * 1024) });
    try {
      const before = await snapshot();
      const header = Buffer.from('NRRD0004\ntype: float\ndimension: 3\nsizes: 200 200 200\nspacings: 1 1 1\nencoding: raw\nendian: little\n\n');
      const m = multipartBody([['publicationId', pub], ['title', `Oversize ${RUN_ID}`], ['format', 'nrrd'], ['cube', Buffer.concat([header, Buffer.alloc(20 * 1024 * 1024)]), 'big.nrrd']]);
      const res = await small.http().post('/api/uploads').set(auth(tok.illustrator)).set('Content-Type', m.type).send(m.body);
      expect(res.status).toBe(413);
      expect(JSON.stringify(res.body.message)).toMatch(/cube: larger than the upload limit/);
      expect(await snapshot()).toEqual(before);
      const s3 = new S3Client({ endpoint: process.env.S3_ENDPOINT, region: 'us-east-1', forcePathStyle: true, credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID!, secretAccessKey: process.env.S3_SECRET_ACCESS_KEY! } });
      const pending = await s3.send(new ListMultipartUploadsCommand({ Bucket: process.env.S3_BUCKET, Prefix: 'tmp/' }));
      s3.destroy();
      expect(pending.Uploads ?? []).toEqual([]);
    } finally {
      await small.close();
    }
  }, 120_000);

});
