import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import type { SwatchbookDto } from '@psiform/contracts';
import { json, mockFetch, renderApp, signedInRoutes, storeSession, user } from '../test/utils';
import { files, exportFileName } from './fileIo';

function book(o: Partial<SwatchbookDto> = {}): SwatchbookDto {
  return {
    id: 's1',
    name: 'Quillmere plates',
    ownerId: 'u-art_director',
    publicationId: 'p1',
    publisher: null,
    colors: { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#222222', wheel: { lightness: 0.7, chroma: 0.11 } },
    locked: false,
    version: 3,
    createdAt: '2025-01-05T10:00:00.000Z',
    updatedAt: '2025-01-06T10:00:00.000Z',
    ...o,
  };
}

/** Types a full hex into a swatch's text field (select-all then type, as a person would). */
async function setHex(ue: ReturnType<typeof userEvent.setup>, name: string, hex: string) {
  const input = screen.getByTestId(`sw-${name}-hex`) as HTMLInputElement;
  await ue.clear(input);
  await ue.type(input, hex);
}

/** An art director with no swatchbooks yet opens the editor of a new one (the starting colours). */
async function openNewSwatchbook() {
  const me = user('art_director');
  mockFetch({ ...signedInRoutes(me), 'GET /api/swatchbooks': () => json(200, []) });
  storeSession(me);
  const ue = userEvent.setup();
  renderApp('/swatchbooks');
  await ue.click(await screen.findByTestId('sw-new'));
  return ue;
}

describe('swatchbook editor: live checks in the browser', () => {
  it('warns about a label too close to the background, at the WCAG 4.5:1 boundary', async () => {
    const ue = await openNewSwatchbook();
    expect(screen.queryByTestId('check-warning')).toBeNull(); // the starting colours pass every check
    expect(screen.getByTestId('check-all-clear')).toBeTruthy();

    // #767676 on white is about 4.54:1, the lightest grey that passes AA text; #777777 is about 4.48:1 (common practice, WebAIM's
    // contrast checker; from memory). WCAG 2.1 relative luminance: L(#76) = ((0x76/255 + 0.055)/1.055)^2.4 = 0.1812 -> 1.05/0.2312 = 4.54.
    await setHex(ue, 'label', '#767676');
    expect(screen.getByTestId('check-contrast-label').textContent).toBe('4.54:1');
    expect(screen.queryByTestId('check-warning')).toBeNull();
    await setHex(ue, 'label', '#777777');
    expect(screen.getByTestId('check-contrast-label').textContent).toBe('4.48:1');
    const warn = screen.getAllByTestId('check-warning').filter((w) => w.getAttribute('data-code') === 'label_contrast_low');
    expect(warn).toHaveLength(1);
    expect(warn[0].textContent).toContain('4.5:1');
    expect(screen.getByTestId('check-contrast-label-verdict').textContent).toBe('low');

    // Nearly white on white: an error-level warning (below 3:1).
    await setHex(ue, 'label', '#f0f0f0');
    expect(screen.getByTestId('check-contrast-label').textContent).toBe('1.14:1');
    expect(screen.getByTestId('check-contrast-label-verdict').textContent).toBe('too low');
    // The sample figure's label follows the colour in every preview; a neutral grey looks the same to every
    // simulated dichromat (each Machado 2009 matrix row sums to 1).
    for (const kind of ['normal', 'protanopia', 'deuteranopia', 'tritanopia']) {
      expect(screen.getByTestId(`cvd-preview-${kind}`).querySelector('[data-part="label"]')?.getAttribute('fill')).toBe('#f0f0f0');
    }
  });

  it('recomputes the phase ΔE00 as a colour changes, and flags phases that cannot be told apart', async () => {
    const ue = await openNewSwatchbook();
    const first = screen.getByTestId('check-de-normal').textContent;
    expect(Number(first)).toBeGreaterThan(20);

    await setHex(ue, 'negative', '#1f5e5b'); // same as positive (Psiform's default verdigris): no difference at all
    expect(screen.getByTestId('check-de-normal').textContent).toBe('0.0');
    for (const k of ['protanopia', 'deuteranopia', 'tritanopia']) expect(screen.getByTestId(`check-de-${k}`).textContent).toBe('0.0');
    expect(screen.getByTestId('check-de-normal-verdict').textContent).toBe('too low');
    expect(screen.getAllByTestId('check-warning').some((w) => w.getAttribute('data-code') === 'phases_too_similar')).toBe(true);

    await setHex(ue, 'negative', '#a86a1c');
    expect(screen.getByTestId('check-de-normal').textContent).toBe(first);

    // The colour picker drives the same state as the hex text.
    fireEvent.input(screen.getByTestId('sw-negative-picker'), { target: { value: '#3a7d44' } });
    await waitFor(() => expect((screen.getByTestId('sw-negative-hex') as HTMLInputElement).value).toBe('#3a7d44'));
    expect(screen.getByTestId('check-de-normal').textContent).not.toBe(first);
    expect(screen.getByTestId('cvd-preview-normal').querySelector('[data-part="negative"]')?.getAttribute('fill')).toBe('#3a7d44');
    expect(screen.getByTestId('check-gamut').textContent).toContain('ICC profile');
  });

  it('creates a swatchbook with the edited colours and opens it', async () => {
    const me = user('art_director');
    let created: SwatchbookDto | null = null;
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks': () => json(200, created ? [created] : []),
      'POST /api/swatchbooks': ({ body }) => {
        const b = body as Pick<SwatchbookDto, 'name' | 'colors'>;
        created = book({ id: 's9', name: b.name, colors: b.colors, version: 1 });
        return json(201, created);
      },
      'GET /api/swatchbooks/s9': () => json(200, created),
      'GET /api/swatchbooks/s9/versions': () => json(200, [{ version: 1, name: created!.name, colors: created!.colors, locked: false, action: 'create', authorId: me.id, createdAt: '2025-01-05T10:00:00Z' }]),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/swatchbooks');
    await ue.click(await screen.findByTestId('sw-new'));
    expect((screen.getByTestId('sw-save') as HTMLButtonElement).disabled).toBe(true); // no name yet
    await ue.type(screen.getByTestId('sw-name'), 'Fenwright journal');
    await setHex(ue, 'positive', '#b5452f');
    await ue.click(screen.getByTestId('sw-save'));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/swatchbooks/s9'));
    const [post] = api.callsTo('POST', '/api/swatchbooks');
    expect(post.body).toMatchObject({ name: 'Fenwright journal', colors: { positive: '#b5452f', negative: '#a86a1c', background: '#ffffff' } });
    expect((await screen.findByTestId('swatchbook-title')).textContent).toBe('Fenwright journal');
    expect(await screen.findAllByTestId('sw-version-row')).toHaveLength(1);
  });

  it('a colour that is not #rrggbb keeps its text and the message (it never silently turns back), and holds Save', async () => {
    const ue = await openNewSwatchbook();
    await ue.type(screen.getByTestId('sw-name'), 'Quillmere plates');
    expect((screen.getByTestId('sw-save') as HTMLButtonElement).disabled).toBe(false);
    await setHex(ue, 'negative', '#zzz');
    await ue.click(screen.getByTestId('sw-name')); // leave the field
    expect((screen.getByTestId('sw-negative-hex') as HTMLInputElement).value).toBe('#zzz');
    // The wording of libs/contracts HEX_COLOUR_MESSAGE, as the server's 400 says it.
    expect(screen.getByTestId('sw-negative-error').textContent).toBe('“#zzz”: must be a colour like #1a2b3c (# and six hex digits).');
    expect((screen.getByTestId('sw-save') as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByTestId('sw-save-blocked').textContent).toBe('Saving waits for the colour marked in red.');
    await setHex(ue, 'negative', '#a86a1c');
    expect(screen.queryByTestId('sw-negative-error')).toBeNull();
    expect((screen.getByTestId('sw-save') as HTMLButtonElement).disabled).toBe(false);
  });

  it('shows the server 400 messages when saving fails', async () => {
    const me = user('art_director');
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks/s1': () => json(200, book()),
      'GET /api/swatchbooks/s1/versions': () => json(200, []),
      'PATCH /api/swatchbooks/s1': () => json(400, { statusCode: 400, message: ['colors.label must be a #rrggbb colour'], error: 'Bad Request' }),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/swatchbooks/s1');
    await screen.findByTestId('swatchbook-editor');
    await setHex(ue, 'label', '#333333');
    await ue.click(screen.getByTestId('sw-save'));
    expect((await screen.findByTestId('sw-save-error')).textContent).toContain('colors.label must be a #rrggbb colour');
  });

  it('locks and unlocks; a locked swatchbook cannot be edited', async () => {
    const me = user('art_director');
    let current = book();
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks/s1': () => json(200, current),
      'GET /api/swatchbooks/s1/versions': () => json(200, []),
      'POST /api/swatchbooks/s1/lock': () => json(200, (current = { ...current, locked: true })),
      'POST /api/swatchbooks/s1/unlock': () => json(200, (current = { ...current, locked: false })),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/swatchbooks/s1');
    await ue.click(await screen.findByTestId('sw-lock'));
    expect(await screen.findByTestId('swatchbook-locked')).toBeTruthy();
    expect((screen.getByTestId('sw-label-hex') as HTMLInputElement).disabled).toBe(true);
    expect(screen.queryByTestId('sw-save')).toBeNull();
    await ue.click(screen.getByTestId('sw-unlock'));
    await waitFor(() => expect((screen.getByTestId('sw-label-hex') as HTMLInputElement).disabled).toBe(false));
    expect(api.callsTo('POST', '/api/swatchbooks/s1/lock')).toHaveLength(1);
    expect(api.callsTo('POST', '/api/swatchbooks/s1/unlock')).toHaveLength(1);
  });

  it('other roles read a swatchbook and its checks but get no edit controls', async () => {
    const me = user('editor');
    mockFetch({ ...signedInRoutes(me), 'GET /api/swatchbooks/s1': () => json(200, book()), 'GET /api/swatchbooks/s1/versions': () => json(200, []) });
    storeSession(me);
    renderApp('/swatchbooks/s1');
    await screen.findByTestId('colour-checks');
    expect(screen.queryByTestId('sw-lock')).toBeNull();
    expect(screen.queryByTestId('sw-save')).toBeNull();
    expect((screen.getByTestId('sw-positive-hex') as HTMLInputElement).disabled).toBe(true);
  });
});

describe('swatchbook files', () => {
  it('exports the server file as a download named after the swatchbook', async () => {
    const me = user('art_director');
    const file = { format: 'psiform-swatchbook', formatVersion: 1, name: 'Quillmere plates', colors: book().colors, exportedAt: '2025-01-07T00:00:00Z' };
    mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks/s1': () => json(200, book()),
      'GET /api/swatchbooks/s1/versions': () => json(200, []),
      'GET /api/swatchbooks/s1/export': () => json(200, file),
    });
    const download = vi.spyOn(files, 'download').mockImplementation(() => {});
    storeSession(me);
    renderApp('/swatchbooks/s1');
    await userEvent.setup().click(await screen.findByTestId('sw-export'));
    await waitFor(() => expect(download).toHaveBeenCalledTimes(1));
    expect(download.mock.calls[0][0]).toBe('quillmere-plates.swatchbook.json');
    expect(JSON.parse(download.mock.calls[0][1])).toEqual(file);
    expect(exportFileName('  ')).toBe('swatchbook.swatchbook.json');
  });

  it('imports a chosen JSON file through the server and says so when the file is not JSON', async () => {
    const me = user('art_director');
    const api = mockFetch({
      ...signedInRoutes(me),
      'GET /api/swatchbooks': () => json(200, [book()]),
      'POST /api/swatchbooks/import': () => json(201, book({ id: 's5', name: 'Imported' })),
      'GET /api/swatchbooks/s5': () => json(200, book({ id: 's5', name: 'Imported' })),
      'GET /api/swatchbooks/s5/versions': () => json(200, []),
    });
    storeSession(me);
    const ue = userEvent.setup();
    renderApp('/swatchbooks');
    const row = await screen.findByTestId('swatchbook-row');
    expect(within(row).getByTestId('swatchbook-name').textContent).toBe('Quillmere plates');
    const input = screen.getByTestId('sw-import-file') as HTMLInputElement;
    await ue.upload(input, new File(['not json'], 'bad.json', { type: 'application/json' }));
    expect((await screen.findByTestId('sw-import-error')).textContent).toContain('bad.json is not a JSON file');
    expect(api.callsTo('POST', '/api/swatchbooks/import')).toHaveLength(0);
    const doc = { format: 'psiform-swatchbook', formatVersion: 1, name: 'Imported', colors: book().colors };
    await ue.upload(input, new File([JSON.stringify(doc)], 'ok.json', { type: 'application/json' }));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/swatchbooks/s5'));
    // The file goes to the server as read, plus the publication the new swatchbook belongs to (the user's first).
    expect(api.callsTo('POST', '/api/swatchbooks/import')[0].body).toEqual({ ...doc, publicationId: 'p1' });
  });
});
