import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { parseRecipe } from '@psiform/contracts';
import { json, mockFetch, PUBLICATIONS, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { figure } from '../test/figures';
import { checkQuantumNumbers } from '../figures/quantum';

const submit = () => screen.getByTestId('nf-submit') as HTMLButtonElement;

async function openForm(routes: Parameters<typeof mockFetch>[0] = {}) {
  const me = user('illustrator');
  const api = mockFetch({ ...signedInRoutes(me, [PUBLICATIONS[0]]), ...routes });
  storeSession(me);
  const ue = userEvent.setup();
  renderApp('/figures/new?publicationId=p1');
  await screen.findByTestId('new-figure-form');
  return { api, ue };
}

async function retype(ue: ReturnType<typeof userEvent.setup>, testId: string, text: string) {
  const el = screen.getByTestId(testId);
  await ue.clear(el);
  if (text) await ue.type(el, text);
}

describe('new figure: quantum-number rules as you type', () => {
  it('checkQuantumNumbers names each broken rule with the allowed values', () => {
    expect(checkQuantumNumbers('2', '2', '0').l).toBe('l must be less than n (got n=2, l=2): with n = 2, l can be 0 or 1.');
    expect(checkQuantumNumbers('3', '1', '-2').m).toBe('|m| must not exceed l (got l=1, m=-2): with l = 1, m can be −1, 0 or 1.');
    expect(checkQuantumNumbers('13', '0', '0').n).toBe('n must be between 1 and 12 (got n=13).');
    expect(checkQuantumNumbers('0', '0', '0').n).toBe('n must be between 1 and 12 (got n=0).');
    expect(checkQuantumNumbers('2.5', '0', '0').n).toBe('n must be a whole number.');
    expect(checkQuantumNumbers('4', '3', '−3')).toMatchObject({ n: null, l: null, m: null, values: { n: 4, l: 3, m: -3 } });
    expect(checkQuantumNumbers('1', '0', '0').values).toEqual({ n: 1, l: 0, m: 0 });
  });

  it('shows the messages inline while typing and keeps submit disabled until all rules hold', async () => {
    const { ue } = await openForm();
    await ue.type(screen.getByTestId('nf-title'), 'Plate 3: 3d orbital');
    await ue.click(screen.getByTestId('nf-mode-nlm'));
    // Defaults 2, 1, 0 are valid.
    expect(screen.queryByTestId('nf-l-error')).toBeNull();
    expect(submit().disabled).toBe(false);

    await retype(ue, 'nf-l', '2');
    expect(screen.getByTestId('nf-l-error').textContent).toBe('l must be less than n (got n=2, l=2): with n = 2, l can be 0 or 1.');
    expect(submit().disabled).toBe(true);

    await retype(ue, 'nf-n', '3');
    expect(screen.queryByTestId('nf-l-error')).toBeNull();
    expect(submit().disabled).toBe(false);

    await retype(ue, 'nf-m', '-3');
    expect(screen.getByTestId('nf-m-error').textContent).toBe('|m| must not exceed l (got l=2, m=-3): with l = 2, m can be −2, −1, 0, 1 or 2.');
    expect(submit().disabled).toBe(true);

    await retype(ue, 'nf-n', '13');
    expect(screen.getByTestId('nf-n-error').textContent).toBe('n must be between 1 and 12 (got n=13).');

    await retype(ue, 'nf-n', '3');
    await retype(ue, 'nf-m', '-2');
    expect(screen.queryByTestId('nf-m-error')).toBeNull();
    expect(submit().disabled).toBe(false);
    // 3d, m = −2 in the real basis is d_xy; the statement of the model is shown.
    expect(screen.getByTestId('nf-summary').textContent).toBe(
      '3d_xy, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 96³ — many-electron orbitals differ.',
    );

    await retype(ue, 'nf-grid', '400');
    expect(screen.getByTestId('nf-grid-error').textContent).toBe('Grid N must be between 16 and 384 (got 400).');
    expect(submit().disabled).toBe(true);
    await retype(ue, 'nf-grid', '128');
    // 128³ × 4 bytes = 8,388,608 bytes, one field for a real state.
    expect(screen.getByTestId('nf-memory').textContent).toBe('128³ × 4 bytes × 1 = 8.4 MB for one field (real ψ)');

    await ue.selectOptions(screen.getByTestId('nf-basis'), 'complex');
    expect(screen.getByTestId('nf-memory').textContent).toBe('128³ × 4 bytes × 2 = 16.8 MB for two fields (complex ψ)');

    await retype(ue, 'nf-fraction', '1');
    expect(screen.getByTestId('nf-fraction-error').textContent).toContain('between 0 and 1');
    expect(submit().disabled).toBe(true);
    await retype(ue, 'nf-fraction', '0.95');
    await retype(ue, 'nf-z', '0');
    expect(screen.getByTestId('nf-z-error').textContent).toBe('Z must be between 1 and 118 (got 0).');
    expect(submit().disabled).toBe(true);
  });

  it('reads orbital labels and explains unknown ones', async () => {
    const { ue } = await openForm();
    await ue.type(screen.getByTestId('nf-title'), 'Hybrid plate');
    await retype(ue, 'nf-label', '3dz2');
    expect(screen.getByTestId('nf-summary').textContent).toMatch(/^3d_z², Z = 1, one-electron hydrogen-like model/);
    await retype(ue, 'nf-label', '2dxy');
    expect(screen.getByTestId('nf-label-error').textContent).toContain('l must be less than n (got n=2, l=2)');
    expect(submit().disabled).toBe(true);
    await retype(ue, 'nf-label', '3qx');
    expect(screen.getByTestId('nf-label-error').textContent).toContain('is not recognised');
    await retype(ue, 'nf-label', 'sp3');
    expect(screen.queryByTestId('nf-label-error')).toBeNull();
    expect(screen.getByTestId('nf-summary').textContent).toMatch(/^sp³ #1, Z = 1/);
    expect(submit().disabled).toBe(false);
  });

  it('posts a recipe that passes the shared schema, then opens the new figure', async () => {
    const { api, ue } = await openForm({
      'POST /api/figures': ({ body }) => json(201, figure({ id: 'f-new', title: (body as { title: string }).title })),
      'GET /api/figures/f-new': () => json(200, figure({ id: 'f-new' })),
    });
    await ue.type(screen.getByTestId('nf-title'), 'Plate 9: 2p_z');
    await retype(ue, 'nf-grid', '48');
    await ue.click(submit());
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/figures/f-new'));
    const [post] = api.callsTo('POST', '/api/figures');
    const body = post.body as { publicationId: string; title: string; recipe: unknown };
    expect(body.publicationId).toBe('p1');
    expect(body.title).toBe('Plate 9: 2p_z');
    expect(body.recipe).toEqual({
      version: 1,
      label: '2p_z',
      content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] },
      grid: { n: 48, extent: 'auto' },
      surface: { rule: 'enclosed', fraction: 0.9 },
    });
    expect(parseRecipe(body.recipe).ok).toBe(true);
  });

  it("shows the server's 400 messages as a readable list and stays on the form", async () => {
    const { ue } = await openForm({
      'POST /api/figures': () =>
        json(400, {
          statusCode: 400,
          error: 'Bad Request',
          message: ['recipe.content.terms.0.l: l must be less than n (got n=2, l=2)', 'title must be shorter than 200 characters'],
        }),
    });
    await ue.type(screen.getByTestId('nf-title'), 'Plate 10');
    await ue.click(submit());
    const err = await screen.findByTestId('nf-server-error');
    const items = Array.from(err.querySelectorAll('li')).map((li) => li.textContent);
    expect(items).toEqual(['recipe.content.terms.0.l: l must be less than n (got n=2, l=2)', 'title must be shorter than 200 characters']);
    expect(screen.getByTestId('location').textContent).toBe('/figures/new');
  });
});
