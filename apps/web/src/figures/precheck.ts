import { UPLOAD_LIMITS } from '@psiform/contracts';

/**
 * Client-side checks of a density cube before it is uploaded, so an obvious mistake is named at once
 * instead of after a long upload. The server checks again (and is the authority).
 */

export interface Sidecar {
  sizes: [number, number, number];
  spacing: number | [number, number, number];
  origin?: [number, number, number];
  quantity: 'psi' | 'density';
}

export type Check<T> = { ok: true; value: T } | { ok: false; message: string };

export const NRRD_HEADER_WINDOW = 4096;

/** NRRD header (text up to the first blank line; NRRD0001..5 magic, `sizes:` field) read from the first 4 KB. */
export function checkNrrdHeader(head: string): Check<{ sizes: number[]; type: string | null }> {
  const lines = head.split(/\r?\n/);
  if (!/^NRRD000[1-5]$/.test(lines[0]?.trim() ?? '')) {
    return { ok: false, message: 'This file does not start with an NRRD magic line (NRRD0001 … NRRD0005).' };
  }
  const end = lines.findIndex((l, i) => i > 0 && l.trim() === '');
  if (end < 0 && head.length >= NRRD_HEADER_WINDOW) {
    return { ok: false, message: 'The NRRD header does not end (no blank line) within the first 4 KB.' };
  }
  const header = end < 0 ? lines : lines.slice(0, end);
  let sizes: number[] | null = null;
  let dimension: number | null = null;
  let type: string | null = null;
  for (const line of header.slice(1)) {
    if (line.startsWith('#')) continue;
    const m = /^([^:]+):=?\s*(.*)$/.exec(line);
    if (!m) continue;
    const key = m[1].trim().toLowerCase();
    const value = m[2].trim();
    if (key === 'sizes') sizes = value.split(/\s+/).map(Number);
    else if (key === 'dimension') dimension = Number(value);
    else if (key === 'type') type = value;
  }
  if (!sizes) return { ok: false, message: 'The NRRD header has no "sizes:" field.' };
  if (sizes.length !== 3 || sizes.some((s) => !Number.isInteger(s) || s < UPLOAD_LIMITS.sizeMin)) {
    return { ok: false, message: `The NRRD "sizes:" field must list three whole numbers of at least ${UPLOAD_LIMITS.sizeMin} (got "${sizes.join(' ')}").` };
  }
  if (sizes.some((s) => s > UPLOAD_LIMITS.sizeMax)) {
    return { ok: false, message: `Each axis of an uploaded cube has at most ${UPLOAD_LIMITS.sizeMax} points (the NRRD says ${sizes.join(' × ')}).` };
  }
  if (dimension !== null && dimension !== 3) {
    return { ok: false, message: `A density cube has 3 dimensions; this NRRD header says dimension ${dimension}.` };
  }
  return { ok: true, value: { sizes, type } };
}

function isTriple(v: unknown, pred: (x: number) => boolean): v is [number, number, number] {
  return Array.isArray(v) && v.length === 3 && v.every((x) => typeof x === 'number' && pred(x));
}

/** The raw cube's JSON sidecar: {"sizes":[nx,ny,nz], "spacing": d or [dx,dy,dz], "origin"?: [x,y,z], "quantity": "psi"|"density"}. */
export function parseSidecar(text: string): Check<Sidecar> {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    return { ok: false, message: `The sidecar is not valid JSON (${err instanceof Error ? err.message : String(err)}).` };
  }
  if (typeof doc !== 'object' || doc === null || Array.isArray(doc)) {
    return { ok: false, message: 'The sidecar must be a JSON object with sizes, spacing and quantity.' };
  }
  const d = doc as Record<string, unknown>;
  const { sizeMin, sizeMax } = UPLOAD_LIMITS;
  if (!isTriple(d.sizes, (x) => Number.isInteger(x) && x >= sizeMin && x <= sizeMax)) {
    return { ok: false, message: `sidecar.sizes must be three whole numbers from ${sizeMin} to ${sizeMax}, e.g. [64, 64, 64].` };
  }
  const spacingOk =
    (typeof d.spacing === 'number' && Number.isFinite(d.spacing) && d.spacing > 0) ||
    isTriple(d.spacing, (x) => Number.isFinite(x) && x > 0);
  if (!spacingOk) {
    return { ok: false, message: 'sidecar.spacing must be a positive number or three positive numbers (in a0).' };
  }
  if (d.origin !== undefined && !isTriple(d.origin, Number.isFinite)) {
    return { ok: false, message: 'sidecar.origin, when given, must be three numbers (in a0).' };
  }
  if (d.quantity !== 'psi' && d.quantity !== 'density') {
    return { ok: false, message: 'sidecar.quantity must be "psi" or "density".' };
  }
  return {
    ok: true,
    value: { sizes: d.sizes, spacing: d.spacing as Sidecar['spacing'], origin: d.origin as Sidecar['origin'], quantity: d.quantity },
  };
}

/** A raw cube is little-endian float32, x fastest: exactly nx·ny·nz·4 bytes. */
export function checkRawBytes(bytes: number, sizes: readonly number[]): string | null {
  const expected = sizes.reduce((a, b) => a * b, 1) * 4;
  if (bytes === expected) return null;
  const fmt = (x: number) => x.toLocaleString('en-GB');
  return (
    `The cube file has ${fmt(bytes)} bytes, but the sidecar's sizes ${sizes.join(' × ')} as float32 need ` +
    `${sizes.join(' × ')} × 4 = ${fmt(expected)} bytes.`
  );
}

async function blobText(blob: Blob): Promise<string> {
  if (typeof blob.text === 'function') return blob.text();
  return new Response(blob).text();
}

export interface PrecheckInput {
  format: 'nrrd' | 'raw';
  cube: File | null;
  sidecar: File | null;
}

/** Reads what it needs of the files and returns the first problem in words, or a short summary when fine. */
export async function precheckCube(input: PrecheckInput): Promise<Check<string>> {
  if (!input.cube) return { ok: false, message: 'Choose the cube file to upload.' };
  if (input.cube.size === 0) return { ok: false, message: 'The cube file is empty.' };
  if (input.format === 'nrrd') {
    const head = await blobText(input.cube.slice(0, NRRD_HEADER_WINDOW));
    const h = checkNrrdHeader(head);
    if (!h.ok) return h;
    return { ok: true, value: `NRRD header read: sizes ${h.value.sizes.join(' × ')}${h.value.type ? `, type ${h.value.type}` : ''}.` };
  }
  if (!input.sidecar) return { ok: false, message: 'A raw cube needs its JSON sidecar (sizes, spacing, quantity).' };
  const sc = parseSidecar(await blobText(input.sidecar));
  if (!sc.ok) return sc;
  const sizeErr = checkRawBytes(input.cube.size, sc.value.sizes);
  if (sizeErr) return { ok: false, message: sizeErr };
  return { ok: true, value: `Raw float32 cube ${sc.value.sizes.join(' × ')} of ${sc.value.quantity === 'psi' ? 'ψ' : 'density |ψ|²'}.` };
}
