import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import { DEFAULT_DELIVERY_PROFILE, PREFLIGHT_RULES, type DeliveryProfileDto, type PreflightReport } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, openAs, retype } from '../test/utils';
import { figure } from '../test/figures';
import { profileErrors } from './DeliveryProfilePage';

vi.mock('../viewport/FigureViewport', () => ({ default: () => <div data-testid="viewport-probe" /> }));

const DTO: DeliveryProfileDto = { publicationId: 'p1', ...DEFAULT_DELIVERY_PROFILE, isDefault: true, updatedAt: null, updatedBy: null };

describe('profileErrors', () => {
  it('names the field of each problem with the schema the server uses', () => {
    expect(profileErrors(DEFAULT_DELIVERY_PROFILE)).toEqual({});
    const e = profileErrors({ ...DEFAULT_DELIVERY_PROFILE, minDpi: 50, columnWidthsMm: [{ name: 'single', widthMm: 5 }] });
    expect(e.minDpi).toBe('at least 72');
    expect(e['columnWidthsMm.widthMm']).toBe('at least 20 mm');
  });
});

describe('delivery profile form', () => {
  it('an art director sees the defaults, gets an inline message for a bad value, and saves the profile', async () => {
    const me = user('art_director');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/publications/p1/delivery-profile': () => json(200, DTO),
      'PUT /api/publications/p1/delivery-profile': ({ body }) => json(200, { ...DTO, ...(body as object), isDefault: false }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/publications/p1/delivery-profile');
    expect(await screen.findByTestId('dp-default')).toBeTruthy();
    const dpi = screen.getByTestId('dp-min-dpi') as HTMLInputElement;
    await retype(ue, dpi, '50');
    expect((await screen.findByTestId('dp-error-minDpi')).textContent).toBe('at least 72');
    expect((screen.getByTestId('dp-save') as HTMLButtonElement).disabled).toBe(true);
    await retype(ue, dpi, '1200');
    await waitFor(() => expect(screen.queryByTestId('dp-error-minDpi')).toBeNull());
    await ue.selectOptions(screen.getByTestId('dp-press'), 'gracol');
    await ue.click(screen.getByTestId('dp-save'));
    await waitFor(() => expect(api.callsTo('PUT', '/api/publications/p1/delivery-profile')).toHaveLength(1));
    expect(api.callsTo('PUT', '/api/publications/p1/delivery-profile')[0].body).toEqual({ ...DEFAULT_DELIVERY_PROFILE, minDpi: 1200, pressCondition: 'gracol' });
    expect(await screen.findByTestId('dp-saved')).toBeTruthy();
  });

  it('an editor reads it without a save button', async () => {
    openAs('editor', '/publications/p1/delivery-profile', { 'GET /api/publications/p1/delivery-profile': () => json(200, { ...DTO, isDefault: false }) });
    expect(await screen.findByTestId('delivery-profile-form')).toBeTruthy();
    expect(screen.queryByTestId('dp-save')).toBeNull();
  });
});

const failing: PreflightReport = {
  profile: DEFAULT_DELIVERY_PROFILE,
  checkedAt: '2025-01-01T00:00:00Z',
  passed: false,
  files: [{ file: 'figure.tif', format: 'tiff', passed: false, results: PREFLIGHT_RULES.map((r) => ({ rule: r.id, status: r.id === 'resolution' ? 'fail' : 'pass', expected: r.id === 'resolution' ? 'at least 600 dpi (combination art)' : 'x', actual: r.id === 'resolution' ? '300 dpi' : 'x' })) }],
};

describe('preflight panel', () => {
  it('lists every rule with pass or fail, and lets an editor approve past the failures with a written reason', async () => {
    const me = user('editor');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, figure({ status: 'in_review' })),
      'GET /api/figures/f1/preflight': () => json(200, { figureId: 'f1', versionNumber: 1, reports: [{ assetId: 'a1', kind: 'tiff', createdAt: '2025-01-01T00:00:00Z', report: failing }], failures: ['tiff figure.tif: resolution: expected at least 600 dpi (combination art); has 300 dpi'], blocksApproval: true }),
      'POST /api/figures/f1/approve': () => json(200, { figureId: 'f1', action: 'approve', fromStatus: 'in_review', status: 'approved', versionNumber: 1, missing: [], message: 'version 1 approved' }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1');
    const panel = await screen.findByTestId('preflight-panel');
    expect(panel.getAttribute('data-blocks')).toBe('true');
    const rows = screen.getAllByTestId('preflight-row');
    expect(rows.map((r) => r.getAttribute('data-rule'))).toEqual(PREFLIGHT_RULES.map((r) => r.id));
    expect(rows.filter((r) => r.getAttribute('data-status') === 'fail').map((r) => r.getAttribute('data-rule'))).toEqual(['resolution']);
    await ue.type(screen.getByTestId('preflight-override-reason'), 'too short');
    expect(screen.getByTestId('preflight-override-short')).toBeTruthy();
    expect((screen.getByTestId('preflight-override-submit') as HTMLButtonElement).disabled).toBe(true);
    await ue.type(screen.getByTestId('preflight-override-reason'), ' — the printer accepts 300 dpi for this plate');
    await ue.click(screen.getByTestId('preflight-override-submit'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/approve')).toHaveLength(1));
    expect(api.callsTo('POST', '/api/figures/f1/approve')[0].body).toEqual({ override: { reason: 'too short — the printer accepts 300 dpi for this plate' } });
  });
});

describe('swatchbook editor: on press', () => {
  it('shows each swatch as the server separates it on the chosen press condition, and the soft proof in those colours', async () => {
    const me = user('art_director');
    const swatch = (name: string, hex: string, proofHex: string, inGamut: boolean) => ({ name, hex, cmyk: [10, 20, 30, 5], totalInk: 65, lab: [50, 0, 0], printedLab: [50, 0, 0], deltaE00: inGamut ? 0.4 : 12.5, inGamut, proofHex, condition: 'x' });
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks': () => json(200, []),
      'POST /api/press-conditions/fogra39/check': ({ body }) => {
        const c = (body as { colours: Record<string, string> }).colours;
        return json(200, { condition: { id: 'fogra39', name: 'FOGRA39 (ISO 12647-2 coated)', tacPercent: 330 }, swatches: Object.entries(c).map(([n, h]) => swatch(n, h, n === 'positive' ? '#123456' : h, n !== 'positive')) });
      },
      'POST /api/press-conditions/swop/check': () => json(200, { condition: { id: 'swop', name: 'SWOP coated #3 (CGATS TR 003)', tacPercent: 300 }, swatches: [] }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/swatchbooks');
    await ue.click(await screen.findByTestId('sw-new'));
    const rows = await screen.findAllByTestId('press-row');
    expect(rows.map((r) => r.getAttribute('data-name'))).toEqual(expect.arrayContaining(['positive', 'negative', 'background', 'label']));
    expect(rows.find((r) => r.getAttribute('data-name') === 'positive')!.textContent).toContain('out of gamut');
    expect(screen.getByTestId('soft-proof-preview').querySelector('[data-part="positive"]')?.getAttribute('fill')).toBe('#123456');
    await ue.selectOptions(screen.getByTestId('sw-press'), 'swop');
    await waitFor(() => expect(api.callsTo('POST', '/api/press-conditions/swop/check').length).toBeGreaterThan(0));
  });
});
