import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, PUBLICATIONS, retype } from '../test/utils';
import { page, summary } from '../test/figures';
import { labelKey, matchFigures, orbitalRecipe, shellOrbitals } from './shell';

describe('shell preset arithmetic', () => {
  it('shell n holds n² real orbitals for n ≤ 4 (l < n, 2l + 1 each); subshell 2p is p_x, p_y, p_z', () => {
    for (const n of [1, 2, 3, 4]) expect(shellOrbitals(n)).toHaveLength(n * n);
    // n = 5: l ≤ 3 only (real forms up to f): 1 + 3 + 5 + 7 = 16.
    expect(shellOrbitals(5)).toHaveLength(16);
    expect(shellOrbitals(2, 1).map((o) => o.label)).toEqual(['2p_x', '2p_y', '2p_z']);
    expect(() => shellOrbitals(2, 2)).toThrow(/l must be from 0 to 1/);
    expect(() => shellOrbitals(8)).toThrow(/n must be/);
  });

  it('matches existing figures by label, each figure at most once', () => {
    const wanted = shellOrbitals(2, 1);
    expect(matchFigures(wanted, [{ id: 'a', label: '2pz' }, { id: 'b', label: '2p_x' }, { id: 'c', label: '2P_X' }])).toEqual(['b', null, 'a']);
    expect(labelKey('3d_x²−y²')).toBe(labelKey('3dx2-y2'));
  });

  it('recipes carry the real-form terms (m = −1 is p_y, libs/orbitals README)', () => {
    const r = orbitalRecipe(shellOrbitals(2, 1)[1]);
    expect(r.label).toBe('2p_y');
    expect(r.content.terms).toEqual([{ n: 2, l: 1, m: -1, basis: 'real', re: 1, im: 0 }]);
    expect(r.grid.n).toBe('auto'); // the engine's state-aware grid, as every new figure
  });
});

describe('Figure sets page', () => {
  it('the 2p preset creates the missing 2p_y, picks x, y, z in order, creates the set and asks for a 178 × 60 mm PNG at the profile\'s 600 dpi', async () => {
    const me = user('illustrator');
    const pub = PUBLICATIONS[0].id;
    const existing = [summary(1, { id: 'fz', title: 'p z', label: '2pz', publicationId: pub }), summary(2, { id: 'fx', title: 'p x', label: '2p_x', publicationId: pub })];
    const created: unknown[] = [];
    const sets: unknown[] = [];
    const { callsTo } = mockFetch({
      ...signedInRoutes(me, [PUBLICATIONS[0]]),
      'GET /api/figures': () => json(200, page(existing, existing.length, 1, 100)),
      'GET /api/figure-sets': () => json(200, sets),
      'POST /api/figures': ({ body }) => {
        created.push(body);
        return json(201, { id: 'fy' });
      },
      'POST /api/figure-sets': ({ body }) => {
        const b = body as { title: string; figureIds: string[]; columns: number };
        const dto = { id: 's1', publicationId: pub, pngAssetId: null, createdBy: me.id, createdAt: new Date(0).toISOString(), ...b };
        sets.push(dto);
        return json(201, dto);
      },
      'POST /api/figure-sets/s1/exports': () => json(201, { jobId: 'j1' }),
    });
    storeSession(me);
    renderApp('/sets');
    const form = await screen.findByTestId('new-set-form');
    await userEvent.selectOptions(within(form).getByTestId('set-shell-l'), '1');
    expect(screen.getByTestId('set-shell-summary').textContent).toMatch(/not yet in this publication.*2p_y/);
    await userEvent.click(screen.getByTestId('set-shell-apply'));
    await waitFor(() => expect(created).toHaveLength(1));
    expect(created[0]).toMatchObject({ publicationId: pub, title: '2p_y', recipe: { label: '2p_y', content: { terms: [{ n: 2, l: 1, m: -1 }] } } });
    expect((screen.getByTestId('set-title') as HTMLInputElement).value).toBe('Shell n = 2 (p)');
    await userEvent.click(screen.getByTestId('set-create'));
    await waitFor(() => expect(callsTo('POST', '/api/figure-sets')).toHaveLength(1));
    expect(callsTo('POST', '/api/figure-sets')[0].body).toEqual({ publicationId: pub, title: 'Shell n = 2 (p)', figureIds: ['fx', 'fy', 'fz'], columns: 3 });

    const exp = await screen.findByTestId('set-export-form');
    await userEvent.clear(within(exp).getByTestId('set-height'));
    await userEvent.type(within(exp).getByTestId('set-height'), '60');
    // No delivery profile stored: the default one's widest column (178 mm) and its minimum 600 dpi come first.
    // round(178 / 25.4 × 600) = 4205, round(60 / 25.4 × 600) = 1417.
    expect(screen.getByTestId('set-pixels').textContent).toMatch(/^4205 × 1417 px .* 3 panels in 3 columns/);
    expect(within(exp).getByTestId('set-preset-double').textContent).toBe('double 178 mm');
    await userEvent.click(screen.getByTestId('set-export'));
    await waitFor(() => expect(callsTo('POST', '/api/figure-sets/s1/exports')).toHaveLength(1));
    expect(callsTo('POST', '/api/figure-sets/s1/exports')[0].body).toEqual({ format: 'png', widthMm: 178, heightMm: 60, dpi: 600 });
    expect(await screen.findByTestId('export-progress')).toBeTruthy();
  });
});

describe('Figure-set picker', () => {
  it('searches and filters the publication’s figures, keeps the picked panels in order, and shows the new set at once', async () => {
    const me = user('illustrator');
    const pub = PUBLICATIONS[0].id;
    const all = [
      summary(1, { id: 'a', title: 'Plate 1', label: '2p_z', publicationId: pub }),
      summary(2, { id: 'b', title: 'Plate 2', label: '3d_xy', publicationId: pub, status: 'approved' }),
      summary(3, { id: 'c', title: 'Plate 3', label: '3d_z²', publicationId: pub }),
      summary(4, { id: 'd', title: 'Cover', label: 'sp³ #1', publicationId: pub }),
    ];
    const sets: unknown[] = [];
    mockFetch({
      ...signedInRoutes(me, [PUBLICATIONS[0]]),
      // The server's search: q over title and label, status exact (as GET /api/figures does).
      'GET /api/figures': ({ url }) => {
        const q = new URL(url, 'http://x').searchParams;
        const needle = (q.get('q') ?? '').toLowerCase();
        const items = all.filter((f) => (!needle || `${f.title} ${f.label}`.toLowerCase().includes(needle)) && (!q.get('status') || f.status === q.get('status')));
        return json(200, page(items, items.length, 1, 100));
      },
      'GET /api/figure-sets': () => json(200, sets),
      'POST /api/figure-sets': ({ body }) => {
        const dto = { id: 's7', publicationId: pub, pngAssetId: null, createdBy: me.id, createdAt: new Date(0).toISOString(), ...(body as object) };
        sets.unshift(dto);
        return json(201, dto);
      },
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/sets');
    await screen.findByTestId('new-set-form');
    // The search is debounced and answered by the server: a loaded machine takes longer than waitFor's default 1 s.
    const rows = () => screen.queryAllByTestId('set-figure-row').map((r) => within(r).getAllByRole('cell')[1].textContent);
    await waitFor(() => expect(rows()).toEqual(['Plate 1', 'Plate 2', 'Plate 3', 'Cover']), { timeout: 5000 });
    await ue.type(screen.getByTestId('set-figure-search'), '3d');
    await waitFor(() => expect(rows()).toEqual(['Plate 2', 'Plate 3']), { timeout: 5000 });
    await ue.selectOptions(screen.getByTestId('set-figure-status'), 'approved');
    await waitFor(() => expect(rows()).toEqual(['Plate 2']), { timeout: 5000 });
    await ue.click(within(screen.getAllByTestId('set-figure-row')[0]).getByTestId('set-figure-check'));
    await ue.selectOptions(screen.getByTestId('set-figure-status'), '');
    await ue.clear(screen.getByTestId('set-figure-search'));
    await ue.selectOptions(screen.getByTestId('set-figure-subshell'), 'p');
    await waitFor(() => expect(rows()).toEqual(['Plate 1']), { timeout: 5000 });
    await ue.click(within(screen.getAllByTestId('set-figure-row')[0]).getByTestId('set-figure-check'));
    await ue.selectOptions(screen.getByTestId('set-figure-subshell'), 'hybrid');
    await waitFor(() => expect(rows()).toEqual(['Cover']), { timeout: 5000 });
    // Picked panels stay listed (lettered, in picking order) whatever the filter shows.
    expect(screen.getAllByTestId('set-picked-item').map((li) => li.getAttribute('data-figure-id'))).toEqual(['b', 'a']);
    expect(screen.getAllByTestId('set-picked-item')[0].textContent).toMatch(/^a Plate 2 \(3dxy\)/);

    // The title limit comes from libs/contracts, in its words.
    await ue.type(screen.getByTestId('set-title'), 'x'.repeat(201));
    expect(screen.getByTestId('set-title-error').textContent).toBe('The title must be at most 200 characters (this one has 201).');
    await retype(ue, screen.getByTestId('set-title'), 'd and p');
    await ue.click(screen.getByTestId('set-create'));
    // The new set is shown at once: named in a notice, selected in the list, its export form open.
    expect((await screen.findByTestId('set-created')).textContent).toContain('Created “d and p” with 2 panels');
    const row = await screen.findByTestId('set-row');
    expect(row.getAttribute('data-set-id')).toBe('s7');
    expect(row.className).toContain('pf-row-selected');
    expect(screen.getByTestId('set-export-form').textContent).toContain('Export “d and p”');
    expect(screen.getByTestId('set-picked-empty')).toBeTruthy(); // the form is ready for the next set
  }, 90_000);
});
