import { screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import { FIGURE_STATUSES, ROLES, type AuditEntryDto, type FigureDto, type FigureStatus, type ReviewDeskItemDto, type Role } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user, type Handler, openAs, retype } from '../test/utils';
import { figure, GLB_ASSET, PROOF_IMAGE, versionSummary } from '../test/figures';
import { availableDecisions, roundFromAudit } from './decisions';
import { formatAge } from './format';

vi.mock('../viewport/FigureViewport', () => ({
  default: (props: { url: string }) => <div data-testid="viewport-probe" data-url={props.url} />,
}));

function deskItem(i: number, ageHours: number, o: Partial<ReviewDeskItemDto> = {}): ReviewDeskItemDto {
  return {
    figureId: `f${i}`,
    title: `Plate ${i}`,
    status: 'in_review',
    publicationId: 'p1',
    publicationTitle: 'Shapes of the Electron Cloud',
    versionNumber: i,
    submittedBy: 'Ilse Marwick',
    submittedAt: new Date(Date.UTC(2025, 1, 10) - ageHours * 3_600_000).toISOString(),
    ageHours,
    editorApproved: false,
    colourSignedOff: false,
    requireColourSignOff: false,
    ...o,
  };
}

function audit(action: string, from: FigureStatus | null, to: FigureStatus | null, i: number, note: string | null = null): AuditEntryDto {
  return { id: `a${i}`, figureId: 'f1', actorId: 'u', actorName: 'Tomas Edevane', action, fromStatus: from, toStatus: to, note, at: `2025-02-0${Math.min(9, i + 1)}T10:00:00.000Z` };
}

describe('formatAge', () => {
  it.each([
    [0.2, '12 min'],
    [0, '1 min'],
    [1, '1 h'],
    [3.9, '3 h'],
    [47.9, '47 h'],
    [48, '2 d'],
    [24 * 9.5, '9 d'],
  ])('%s hours reads "%s"', (h, text) => expect(formatAge(h)).toBe(text));
});

describe('review desk', () => {
  it('lists waiting proofs oldest first with publication, illustrator, version and age, linked to the proof', async () => {
    const me = user('editor');
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/review-desk': () =>
        json(200, [deskItem(1, 3.4), deskItem(2, 50), deskItem(3, 0.5, { submittedBy: null, requireColourSignOff: true, editorApproved: true })]),
    });
    storeSession(me);
    renderApp('/review');
    const rows = await screen.findAllByTestId('desk-row');
    expect(rows.map((r) => within(r).getByTestId('desk-title').textContent)).toEqual(['Plate 2', 'Plate 1', 'Plate 3']);
    expect(rows.map((r) => within(r).getByTestId('desk-age').textContent)).toEqual(['2 d', '3 h', '30 min']);
    expect(within(rows[0]).getByTestId('desk-publication').textContent).toBe('Shapes of the Electron Cloud');
    expect(within(rows[0]).getByTestId('desk-illustrator').textContent).toBe('Ilse Marwick');
    expect(within(rows[2]).getByTestId('desk-illustrator').textContent).toBe('—');
    expect(within(rows[0]).getByTestId('desk-version').textContent).toBe('v2');
    expect(within(rows[2]).getByTestId('desk-needs').textContent).toBe('colour sign-off');
    expect(within(rows[0]).getByTestId('desk-title').getAttribute('href')).toBe('/figures/f2/proof');
  });

  it('is open to art directors too, and says so when nothing waits', async () => {
    openAs('art_director', '/review', { 'GET /api/review-desk': () => json(200, []) });
    expect((await screen.findByTestId('review-desk-empty')).textContent).toContain('No proofs waiting');
  });

  it('shows the server error readably', async () => {
    openAs('editor', '/review', { 'GET /api/review-desk': () => json(500, { statusCode: 500, message: 'boom' }) });
    expect((await screen.findByTestId('review-desk-error')).textContent).toContain('HTTP 500');
  });
});

describe('availableDecisions (mirrors the server transition table)', () => {
  const none = { editorApproved: false, colourSignedOff: false };
  const base = { isOwner: true, requireColourSignOff: true, round: none };
  it.each(FIGURE_STATUSES)('an illustrator never gets Approve, Request changes, Colour sign-off or Release (%s)', (status) => {
    const d = availableDecisions({ ...base, role: 'illustrator', status });
    expect(d.filter((x) => x !== 'submit')).toEqual([]);
    expect(d.includes('submit')).toBe(status === 'draft' || status === 'changes_requested');
  });
  it('an illustrator who does not own the figure cannot submit it', () => {
    expect(availableDecisions({ ...base, isOwner: false, role: 'illustrator', status: 'draft' })).toEqual([]);
  });
  it.each(FIGURE_STATUSES)('an editor in %s', (status) => {
    const d = availableDecisions({ ...base, role: 'editor', status });
    const expected: Record<FigureStatus, string[]> = {
      draft: [],
      changes_requested: [],
      in_review: ['request_changes', 'approve'],
      approved: ['release'],
      released: [],
    };
    expect(d).toEqual(expected[status]);
  });
  it('an editor who already approved (waiting for colour sign-off) may still request changes, not approve twice', () => {
    expect(availableDecisions({ ...base, role: 'editor', status: 'in_review', round: { editorApproved: true, colourSignedOff: false } })).toEqual(['request_changes']);
  });
  it('an art director signs off colour only in review and only where the house style requires it', () => {
    expect(availableDecisions({ ...base, role: 'art_director', status: 'in_review' })).toEqual(['colour_signoff']);
    expect(availableDecisions({ ...base, role: 'art_director', status: 'in_review', requireColourSignOff: false })).toEqual([]);
    expect(availableDecisions({ ...base, role: 'art_director', status: 'in_review', round: { editorApproved: false, colourSignedOff: true } })).toEqual([]);
    expect(availableDecisions({ ...base, role: 'art_director', status: 'approved' })).toEqual([]);
  });
  it('roundFromAudit reads approvals after the latest submit only', () => {
    const trail = [audit('submit', 'draft', 'in_review', 1), audit('approve', 'in_review', 'in_review', 2), audit('request_changes', 'in_review', 'changes_requested', 3), audit('submit', 'changes_requested', 'in_review', 4)];
    expect(roundFromAudit(trail)).toEqual({ editorApproved: false, colourSignedOff: false });
    expect(roundFromAudit([...trail, audit('colour_signoff', 'in_review', 'in_review', 5)])).toEqual({ editorApproved: false, colourSignedOff: true });
    expect(roundFromAudit(trail.slice(0, 2))).toEqual({ editorApproved: true, colourSignedOff: false });
  });
});

function proofRoutes(me: ReturnType<typeof user>, state: { fig: FigureDto; trail: AuditEntryDto[] }, extra: Record<string, Handler> = {}) {
  return mockFetch({
    ...signedInRoutes(me),
    'GET /api/figures/f1': () => json(200, state.fig),
    'GET /api/figures/f1/comments': () => json(200, []),
    'GET /api/figures/f1/audit': () => json(200, state.trail),
    'GET /api/figures/f1/versions': () => json(200, [versionSummary(1, { current: true })]),
    'GET /api/assets/a-glb/link': () => json(200, { url: 'http://storage.test/a.glb', expiresAt: '2030-01-01T00:00:00Z' }),
    ...extra,
  });
}

const BUTTONS = ['submit', 'request_changes', 'approve', 'colour_signoff', 'release'];
async function shownDecisions(): Promise<string[]> {
  const bar = await screen.findByTestId('decision-bar');
  await waitFor(() => expect(bar.querySelector('button:disabled')).toBeNull());
  return BUTTONS.filter((b) => screen.queryByTestId(`decide-${b}`));
}

describe('proof view decisions', () => {
  const cases: [Role, FigureStatus, string[]][] = [
    ['illustrator', 'draft', ['submit']],
    ['illustrator', 'in_review', []],
    ['illustrator', 'approved', []],
    ['editor', 'draft', []],
    ['editor', 'in_review', ['request_changes', 'approve']],
    ['editor', 'approved', ['release']],
    ['art_director', 'in_review', []],
  ];
  it.each(cases)('%s on a %s figure sees %j', async (role, status, expected) => {
    const me = user(role);
    proofRoutes(me, { fig: figure({ status, assets: [GLB_ASSET] }), trail: [] });
    storeSession(me);
    renderApp('/figures/f1/proof');
    expect(await shownDecisions()).toEqual(expected);
  });

  it('an art director sees Colour sign-off where the house style requires it', async () => {
    const me = user('art_director');
    proofRoutes(me, { fig: figure({ status: 'in_review' }), trail: [] }, {
      'GET /api/publications/p1/house-style': () =>
        json(200, { publicationId: 'p1', swatchbookId: 's1', swatchbookName: 'House', requireColourSignOff: true, allowOverride: false, updatedAt: '2025-01-01T00:00:00Z' }),
    });
    storeSession(me);
    renderApp('/figures/f1/proof');
    expect(await shownDecisions()).toEqual(['colour_signoff']);
    expect(screen.getByTestId('signoff-required')).toBeTruthy();
  });

  it('approving posts the decision, refetches the figure and shows Approved and the new audit entry', async () => {
    const me = user('editor');
    const state = { fig: figure({ status: 'in_review' }), trail: [audit('submit', 'draft', 'in_review', 1, 'version 1 submitted as a proof')] };
    const api = proofRoutes(me, state, {
      'POST /api/figures/f1/approve': () => {
        state.fig = { ...state.fig, status: 'approved' };
        state.trail = [...state.trail, audit('approve', 'in_review', 'approved', 2)];
        return json(200, { figureId: 'f1', action: 'approve', fromStatus: 'in_review', status: 'approved', versionNumber: 1, missing: [], message: 'version 1 approved' });
      },
    });
    storeSession(me);
    renderApp('/figures/f1/proof');
    await shownDecisions();
    expect(screen.getByTestId('proof-status').textContent).toBe('In review');
    const before = api.callsTo('GET', '/api/figures/f1').length;
    await userEvent.setup().click(screen.getByTestId('decide-approve'));
    await waitFor(() => expect(screen.getByTestId('proof-status').textContent).toBe('Approved'));
    expect(api.callsTo('GET', '/api/figures/f1').length).toBeGreaterThan(before);
    expect(screen.getByTestId('decision-done').textContent).toBe('Version 1 approved.');
    expect(await shownDecisions()).toEqual(['release']);
    await waitFor(() => expect(screen.getAllByTestId('audit-entry').map((e) => e.getAttribute('data-action'))).toEqual(['submit', 'approve']));
    expect(screen.getAllByTestId('audit-move')[1].textContent).toContain('In review → Approved');
  });

  it('shows a 409 from the server in words, naming the states', async () => {
    const me = user('editor');
    proofRoutes(me, { fig: figure({ status: 'in_review' }), trail: [] }, {
      'POST /api/figures/f1/approve': () =>
        json(409, { statusCode: 409, message: 'cannot approve a figure that is changes_requested: allowed only from in_review', error: 'Conflict' }),
    });
    storeSession(me);
    renderApp('/figures/f1/proof');
    await shownDecisions();
    await userEvent.setup().click(screen.getByTestId('decide-approve'));
    expect((await screen.findByTestId('decision-error')).textContent).toBe(
      "Not possible in the figure's current state: cannot approve a figure that is changes_requested: allowed only from in_review.",
    );
  });

  it('Request changes needs a note before anything is sent', async () => {
    const me = user('editor');
    const api = proofRoutes(me, { fig: figure({ status: 'in_review' }), trail: [] }, {
      'POST /api/figures/f1/request-changes': ({ body }) =>
        json(200, { figureId: 'f1', action: 'request_changes', fromStatus: 'in_review', status: 'changes_requested', versionNumber: 1, missing: [], message: 'changes requested', echo: body }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1/proof');
    await shownDecisions();
    await ue.click(screen.getByTestId('decide-request_changes'));
    const submit = await screen.findByTestId('request-changes-submit');
    expect((submit as HTMLButtonElement).disabled).toBe(true);
    await ue.type(screen.getByTestId('request-changes-note'), '   ');
    expect((submit as HTMLButtonElement).disabled).toBe(true);
    await ue.tab();
    expect(screen.getByText(/A note is required/)).toBeTruthy();
    expect(api.callsTo('POST', '/api/figures/f1/request-changes')).toHaveLength(0);
    await retype(ue, screen.getByTestId('request-changes-note'), 'The negative lobe reads too dark in print.');
    await ue.click(submit);
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/request-changes')).toHaveLength(1));
    expect(api.callsTo('POST', '/api/figures/f1/request-changes')[0].body).toEqual({ note: 'The negative lobe reads too dark in print.' });
  });
});

describe('proof comments and pins', () => {
  it('places a pin by clicking the PNG proof and sends it with the comment', async () => {
    const me = user('editor');
    const png = { ...GLB_ASSET, id: 'a-png', kind: 'png' as const, stats: null };
    let comments: unknown[] = [
      { id: 'c1', figureId: 'f1', versionId: 'v1', authorId: 'u', authorName: 'Tomas Edevane', body: 'Label is small.', pin: { x: 0.1, y: 0.9 }, createdAt: '2025-02-02T10:00:00Z' },
    ];
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/figures/f1': () => json(200, figure({ status: 'in_review', assets: [png] })),
      'GET /api/figures/f1/comments': () => json(200, comments),
      'GET /api/figures/f1/audit': () => json(200, []),
      'GET /api/assets/a-png/link': () => json(200, { url: 'http://storage.test/proof.png', expiresAt: '2030-01-01T00:00:00Z' }),
      'GET /api/figures/f1/versions': () => json(200, [versionSummary(1, { current: true, image: PROOF_IMAGE })]),
      'POST /api/figures/f1/comments': ({ body }) => {
        const c = { id: 'c2', figureId: 'f1', authorId: 'u', authorName: 'Tomas Edevane', createdAt: '2025-02-03T10:00:00Z', ...(body as object) };
        comments = [...comments, c];
        return json(201, c);
      },
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/figures/f1/proof');
    const img = await screen.findByTestId('proof-image');
    expect(img.querySelector('img')?.getAttribute('src')).toBe('http://storage.test/proof.png');
    expect((await screen.findAllByTestId('proof-pin')).map((p) => p.textContent)).toEqual(['1']);
    vi.spyOn(img, 'getBoundingClientRect').mockReturnValue({ left: 100, top: 50, width: 400, height: 200, right: 500, bottom: 250, x: 100, y: 50, toJSON: () => ({}) });
    await ue.pointer({ keys: '[MouseLeft]', target: img, coords: { clientX: 200, clientY: 200 } });
    expect(screen.getByTestId('proof-pin-pending')).toBeTruthy();
    expect(screen.getByText('Pinned at 25% across, 75% down.')).toBeTruthy();
    await ue.type(screen.getByTestId('comment-input'), 'Nucleus dot hidden here.');
    await ue.click(screen.getByTestId('comment-submit'));
    await waitFor(() => expect(api.callsTo('POST', '/api/figures/f1/comments')).toHaveLength(1));
    expect(api.callsTo('POST', '/api/figures/f1/comments')[0].body).toEqual({ body: 'Nucleus dot hidden here.', versionId: 'v1', pin: { x: 0.25, y: 0.75 } });
    await waitFor(() => expect(screen.getAllByTestId('proof-pin').map((p) => p.textContent)).toEqual(['1', '2']));
    expect(screen.queryByTestId('proof-pin-pending')).toBeNull();
    expect(screen.getAllByTestId('comment-body').map((c) => c.textContent)).toEqual(['Label is small.', 'Nucleus dot hidden here.']);
  });

  it('without a PNG the proof shows the existing 3D viewport and says pins need an image', async () => {
    const me = user('editor');
    proofRoutes(me, { fig: figure({ status: 'in_review', assets: [GLB_ASSET] }), trail: [] });
    storeSession(me);
    renderApp('/figures/f1/proof');
    expect((await screen.findByTestId('viewport-probe')).getAttribute('data-url')).toBe('http://storage.test/a.glb');
    expect(screen.getByTestId('proof-3d-note')).toBeTruthy();
    expect(screen.queryByTestId('proof-image')).toBeNull();
  });
});

describe('figure page review section', () => {
  it.each(ROLES.filter((r) => r !== 'admin'))('shows the audit trail to %s', async (role) => {
    const me = user(role);
    proofRoutes(me, {
      fig: figure({ status: 'changes_requested' }),
      trail: [audit('submit', 'draft', 'in_review', 1), audit('request_changes', 'in_review', 'changes_requested', 2, 'Lighter background, please.')],
    });
    storeSession(me);
    renderApp('/figures/f1');
    const entries = await screen.findAllByTestId('audit-entry');
    expect(entries).toHaveLength(2);
    expect(entries[1].textContent).toContain('Tomas Edevane requested changes · In review → Changes requested');
    expect(entries[1].textContent).toContain('Lighter background, please.');
    expect(screen.getByTestId('open-proof').getAttribute('href')).toBe('/figures/f1/proof');
  });
});
