import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import type { FigureDto } from '@psiform/contracts';
import { browser } from '../figures/AssetDownloads';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, openAs, retype } from '../test/utils';
import { figure, GLB_ASSET, job, sseStream, STL_ASSET } from '../test/figures';

// The R3F canvas needs WebGL, which jsdom lacks: the viewport is replaced by a probe of its props.
vi.mock('../viewport/FigureViewport', () => ({
  default: (props: { url: string; palette: { positive: string; negative: string } }) => (
    <div data-testid="viewport-probe" data-url={props.url} data-positive={props.palette.positive} data-negative={props.palette.negative} />
  ),
}));

describe('figure page', () => {
  it('states the model, queues a mesh job, follows it and then shows stats, files and the viewport', async () => {
    const me = user('illustrator');
    let current: FigureDto = figure();
    const stream = sseStream();
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, current),
      'POST /api/figures/f1/meshes': () => json(201, { jobId: 'j1' }),
      'GET /api/jobs/j1/events': () => stream.response,
      'GET /api/assets/a-glb/link': () => json(200, { url: 'http://storage.test/bucket/a.glb?sig=1', expiresAt: '2030-01-01T00:00:00Z' }),
      'GET /api/assets/a-stl/link': () => json(200, { url: 'http://storage.test/bucket/a.stl?sig=2', expiresAt: '2030-01-01T00:00:00Z', fileName: 'plate-1_2pz.stl' }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1');

    const model = await screen.findByTestId('figure-model');
    expect(model.textContent).toBe(
      '2pz, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 48³ — many-electron orbitals differ.', // 2p with a typeset subscript z
    );
    expect(screen.getByTestId('figure-status').textContent).toBe('Draft');
    expect(screen.getByTestId('figure-version').textContent).toBe('Version 1');
    expect(screen.getByTestId('no-mesh')).toBeTruthy();

    await ue.click(screen.getByTestId('compute-mesh'));
    await screen.findByTestId('job-progress');
    expect(api.callsTo('POST', '/api/figures/f1/meshes')).toHaveLength(1);
    expect((screen.getByTestId('compute-mesh') as HTMLButtonElement).disabled).toBe(true); // one job at a time

    stream.send(job({ stage: 'extracting', progress: 60 }));
    await waitFor(() => expect(screen.getByTestId('job-progress-bar').getAttribute('aria-valuenow')).toBe('60'));
    current = figure({ assets: [GLB_ASSET, STL_ASSET], updatedAt: '2025-02-01T10:06:00.000Z' });
    stream.send(job({ state: 'completed', stage: 'done', progress: 100, assets: [GLB_ASSET, STL_ASSET] }));
    stream.close();

    // Completion refetches the figure; its assets bring the stats, the files and the viewport.
    const rows = await screen.findAllByTestId('mesh-stats-row');
    expect(rows).toHaveLength(2);
    expect(Array.from(rows[0].querySelectorAll('td')).map((td) => td.textContent)).toEqual([
      'ψ > 0 (phase +)',
      '1,200',
      '2,396',
      '31.42',
      '12.5',
      '1',
      '2',
      'yes',
    ]);
    expect(within(rows[1]).getByText('ψ < 0 (phase −)')).toBeTruthy();
    expect(screen.getByTestId('mesh-level').textContent).toContain('90.02%');

    const probe = await screen.findByTestId('viewport-probe');
    expect(probe.getAttribute('data-url')).toBe('http://storage.test/bucket/a.glb?sig=1');
    expect(probe.getAttribute('data-positive')).toBe('#1f5e5b');
    expect(probe.getAttribute('data-negative')).toBe('#a86a1c');
    expect((screen.getByTestId('compute-mesh') as HTMLButtonElement).disabled).toBe(false);

    // Downloads ask for a presigned link (a plain link cannot carry the token) and save it under the name the
    // server gives, without navigating the page.
    const save = vi.spyOn(browser, 'download').mockImplementation(() => {});
    expect(screen.getByTestId('download-stl').textContent).toBe('Download STL mesh · 2.0 MB');
    await ue.click(screen.getByTestId('download-stl'));
    await waitFor(() => expect(save).toHaveBeenCalledWith('http://storage.test/bucket/a.stl?sig=2', 'plate-1_2pz.stl'));
    expect(screen.getByTestId('figure-page')).toBeTruthy(); // still on the figure page
    expect(screen.getByTestId('download-saved').textContent).toBe('Saving as plate-1_2pz.stl');
    const [link] = api.callsTo('GET', '/api/assets/a-stl/link');
    expect(link.headers.get('Authorization')).toBe('Bearer tok-1');
  });

  it('renames the figure through PATCH', async () => {
    const me = user('illustrator');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, figure()),
      'PATCH /api/figures/f1': ({ body }) => json(200, figure({ title: (body as { title: string }).title })),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1');
    await screen.findByTestId('figure-model');
    const title = screen.getByTestId('figure-title');
    await ue.click(title.querySelector('.bp6-editable-text') as HTMLElement);
    const input = await waitFor(() => {
      const el = title.querySelector('input');
      if (!el) throw new Error('the title is not in edit mode');
      return el;
    });
    await retype(ue, input, 'Plate 1 (revised){Enter}');
    await waitFor(() => expect(api.callsTo('PATCH', '/api/figures/f1')).toHaveLength(1));
    expect(api.callsTo('PATCH', '/api/figures/f1')[0].body).toEqual({ title: 'Plate 1 (revised)' });
    await waitFor(() => expect(screen.getByTestId('figure-title').textContent).toBe('Plate 1 (revised)'));
  });

  it('says plainly when the figure is not in the user’s publications', async () => {
    openAs('editor', '/figures/nope', { 'GET /api/figures/nope': () => json(404, { statusCode: 404, message: 'Figure not found', error: 'Not Found' }) });
    const err = await screen.findByTestId('figure-error');
    expect(err.textContent).toContain('There is no such figure in the publications you belong to.');
  });

  it('shows a failed job in words and no viewport', async () => {
    const me = user('illustrator');
    const stream = sseStream();
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, figure()),
      'GET /api/jobs/j9/events': () => stream.response,
    });
    storeSession(me);
    renderApp('/figures/f1?job=j9');
    await screen.findByTestId('job-progress');
    stream.send(job({ id: 'j9', state: 'failed', stage: 'extracting', progress: 55, error: 'the surface has no triangles at this isovalue' }));
    stream.close();
    expect((await screen.findByTestId('job-error')).textContent).toBe(
      'The mesh job failed while extracting isosurfaces (marching cubes): the surface has no triangles at this isovalue',
    );
    expect(screen.queryByTestId('viewport-probe')).toBeNull();
  });
});
