import { act, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { vi } from 'vitest';
import { checkNrrdHeader, checkRawBytes, parseSidecar, precheckCube } from '../figures/precheck';
import { json, mockFetch, PUBLICATIONS, renderApp, signedInRoutes, storeSession, user, retype } from '../test/utils';
import { figure } from '../test/figures';

const SIDECAR = JSON.stringify({ sizes: [4, 3, 2], spacing: 0.5, quantity: 'density' });
const file = (parts: BlobPart[], name: string, type = 'application/octet-stream') => new File(parts, name, { type });

describe('upload pre-check', () => {
  it('raw: the byte count must be nx·ny·nz·4 from the sidecar', async () => {
    // 4 × 3 × 2 = 24 float32 values = 96 bytes.
    expect(checkRawBytes(96, [4, 3, 2])).toBeNull();
    expect(checkRawBytes(95, [4, 3, 2])).toBe(
      "The cube file has 95 bytes, but the sidecar's sizes 4 × 3 × 2 as float32 need 4 × 3 × 2 × 4 = 96 bytes.",
    );
    const wrong = await precheckCube({ format: 'raw', cube: file([new Uint8Array(100)], 'c.raw'), sidecar: file([SIDECAR], 's.json') });
    expect(wrong).toEqual({ ok: false, message: expect.stringContaining('has 100 bytes') });
    const right = await precheckCube({ format: 'raw', cube: file([new Float32Array(24)], 'c.raw'), sidecar: file([SIDECAR], 's.json') });
    expect(right).toEqual({ ok: true, value: 'Raw float32 cube 4 × 3 × 2 of density |ψ|².' });
  });

  it('raw: the sidecar fields are named when wrong', () => {
    expect(parseSidecar('{"sizes":[4,3],"spacing":1,"quantity":"psi"}')).toEqual({ ok: false, message: expect.stringContaining('sidecar.sizes') });
    expect(parseSidecar('{"sizes":[4,3,513],"spacing":1,"quantity":"psi"}')).toEqual({ ok: false, message: 'sidecar.sizes must be three whole numbers from 2 to 512, e.g. [64, 64, 64].' });
    expect(parseSidecar('{"sizes":[4,3,2],"spacing":-1,"quantity":"psi"}')).toEqual({ ok: false, message: expect.stringContaining('sidecar.spacing') });
    expect(parseSidecar('{"sizes":[4,3,2],"spacing":[1,1,1],"origin":[0,0],"quantity":"psi"}')).toEqual({ ok: false, message: expect.stringContaining('sidecar.origin') });
    expect(parseSidecar('{"sizes":[4,3,2],"spacing":1,"quantity":"charge"}')).toEqual({ ok: false, message: 'sidecar.quantity must be "psi" or "density".' });
    expect(parseSidecar('{"sizes":')).toEqual({ ok: false, message: expect.stringContaining('not valid JSON') });
    expect(parseSidecar('{"sizes":[4,3,2],"spacing":[0.5,0.5,1],"quantity":"psi"}').ok).toBe(true);
  });

  it('nrrd: the header must be readable in the first 4 KB and give three sizes', async () => {
    const header = 'NRRD0004\n# made for a test\ntype: float\ndimension: 3\nsizes: 8 8 8\nencoding: raw\nendian: little\n\n';
    expect(checkNrrdHeader(header)).toEqual({ ok: true, value: { sizes: [8, 8, 8], type: 'float' } });
    expect(checkNrrdHeader('P6\n8 8\n255\n')).toEqual({ ok: false, message: expect.stringContaining('NRRD magic') });
    expect(checkNrrdHeader('NRRD0004\ntype: float\ndimension: 3\n\n')).toEqual({ ok: false, message: 'The NRRD header has no "sizes:" field.' });
    expect(checkNrrdHeader('NRRD0004\ndimension: 2\nsizes: 8 8\n\n')).toEqual({ ok: false, message: expect.stringContaining('three whole numbers') });
    expect(checkNrrdHeader('NRRD0004\nsizes: 8 8 600\n\n')).toEqual({ ok: false, message: expect.stringContaining('at most 512 points') });
    const long = `NRRD0004\n${'# padding\n'.repeat(500)}`;
    expect(checkNrrdHeader(long.slice(0, 4096))).toEqual({ ok: false, message: expect.stringContaining('within the first 4 KB') });
    const ok = await precheckCube({ format: 'nrrd', cube: file([header, new Float32Array(512)], 'c.nrrd'), sidecar: null });
    expect(ok).toEqual({ ok: true, value: 'NRRD header read: sizes 8 × 8 × 8, type float.' });
  });
});

/** Stands in for XMLHttpRequest: records what is sent, lets the test drive progress and the answer. */
class FakeXhr {
  static last: FakeXhr | null = null;
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: FormData | null = null;
  status = 0;
  responseText = '';
  upload: { onprogress: ((e: { loaded: number; total: number; lengthComputable: boolean }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onabort: (() => void) | null = null;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k] = v;
  }
  send(body: FormData) {
    this.body = body;
  }
  abort() {
    this.onabort?.();
  }
  progress(loaded: number, total: number) {
    this.upload.onprogress?.({ loaded, total, lengthComputable: true });
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = JSON.stringify(body);
    this.onload?.();
  }
}

describe('upload form', () => {
  it('sends the NRRD quantity and the fraction, and refuses a fraction outside (0, 1)', async () => {
    const ue = await openForm();
    await ue.type(screen.getByTestId('upload-title'), 'Imported ψ');
    const header = 'NRRD0004\ntype: float\ndimension: 3\nsizes: 2 2 2\nencoding: raw\nendian: little\n\n';
    await ue.upload(screen.getByTestId('upload-cube'), file([header, new Float32Array(8)], 'cube.nrrd'));
    await waitFor(() => expect(screen.getByTestId('upload-precheck').textContent).toBe('NRRD header read: sizes 2 × 2 × 2, type float.'));
    await ue.click(screen.getByText('density |ψ|² (one surface)'));
    await retype(ue, screen.getByTestId('upload-fraction'), '1.5');
    expect(screen.getByTestId('upload-fraction-error').textContent).toContain('between 0 and 1');
    expect((screen.getByTestId('upload-submit') as HTMLButtonElement).disabled).toBe(true);
    await retype(ue, screen.getByTestId('upload-fraction'), '0.75');
    await ue.click(screen.getByTestId('upload-submit'));
    const xhr = FakeXhr.last!;
    expect([...xhr.body!.entries()].map(([k, v]) => [k, typeof v === 'string' ? v : (v as File).name])).toEqual([
      ['publicationId', 'p1'],
      ['title', 'Imported ψ'],
      ['format', 'nrrd'],
      ['quantity', 'density'],
      ['fraction', '0.75'],
      ['cube', 'cube.nrrd'],
    ]);
    act(() => xhr.answer(400, { statusCode: 400, error: 'Bad Request', message: ['cube: NRRD encoding gzip is not supported'] }));
    expect((await screen.findByTestId('upload-error')).textContent).toContain('cube: NRRD encoding gzip is not supported');
  });

  async function openForm() {
    const me = user('illustrator');
    mockFetch({ ...signedInRoutes(me, [PUBLICATIONS[0]]), 'GET /api/figures/f-up': () => json(200, figure({ id: 'f-up' })) });
    storeSession(me);
    FakeXhr.last = null;
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    const ue = userEvent.setup();
    renderApp('/uploads/new?publicationId=p1');
    await screen.findByTestId('upload-form');
    return ue;
  }

  /** The form filled for a raw cube: a title, the raw format, the 4 × 3 × 2 float32 sidecar and `cube` as the cube file. */
  async function rawCubeChosen(cube: Uint8Array<ArrayBuffer> | Float32Array<ArrayBuffer>) {
    const ue = await openForm();
    await ue.type(screen.getByTestId('upload-title'), 'Imported density');
    await ue.click(screen.getByTestId('upload-format-raw'));
    await ue.upload(screen.getByTestId('upload-sidecar'), file([SIDECAR], 'cube.json', 'application/json'));
    await ue.upload(screen.getByTestId('upload-cube'), file([cube], 'cube.raw'));
    return ue;
  }

  it('names a wrong raw byte count before anything is sent', async () => {
    const ue = await rawCubeChosen(new Uint8Array(90));
    const check = await screen.findByTestId('upload-precheck');
    await waitFor(() =>
      expect(check.textContent).toBe(
        "The cube file has 90 bytes, but the sidecar's sizes 4 × 3 × 2 as float32 need 4 × 3 × 2 × 4 = 96 bytes.",
      ),
    );
    expect((screen.getByTestId('upload-submit') as HTMLButtonElement).disabled).toBe(true);
    await ue.click(screen.getByTestId('upload-submit'));
    expect(FakeXhr.last).toBeNull();
  });

  it('uploads in the server’s part order with progress, shows a 413 readably, then succeeds', async () => {
    const ue = await rawCubeChosen(new Float32Array(24));
    await waitFor(() => expect(screen.getByTestId('upload-precheck').textContent).toBe('Raw float32 cube 4 × 3 × 2 of density |ψ|².'));

    await ue.click(screen.getByTestId('upload-submit'));
    const xhr = FakeXhr.last!;
    expect(xhr.method).toBe('POST');
    expect(xhr.url).toBe('/api/uploads');
    expect(xhr.headers.Authorization).toBe('Bearer tok-1');
    expect([...xhr.body!.keys()]).toEqual(['publicationId', 'title', 'format', 'fraction', 'sidecar', 'cube']);
    expect(xhr.body!.get('fraction')).toBe('0.9');
    expect(xhr.body!.get('format')).toBe('raw');
    expect((xhr.body!.get('cube') as File).size).toBe(96);

    act(() => xhr.progress(48, 200));
    await waitFor(() => expect(screen.getByTestId('upload-progress').getAttribute('aria-valuenow')).toBe('24'));
    expect(screen.getByTestId('upload-percent').textContent).toBe('24% sent');
    act(() => xhr.answer(413, { statusCode: 413, error: 'Payload Too Large', message: 'The cube is larger than the 512 MB upload limit' }));
    const err = await screen.findByTestId('upload-error');
    expect(err.textContent).toContain('The cube is larger than the 512 MB upload limit');

    await ue.click(screen.getByTestId('upload-submit'));
    const again = FakeXhr.last!;
    expect(again).not.toBe(xhr);
    act(() => again.progress(200, 200));
    act(() => again.answer(201, { figureId: 'f-up', assetId: 'a-1' }));
    await waitFor(() => expect(screen.getByTestId('location').textContent).toBe('/figures/f-up'));
  });
});
