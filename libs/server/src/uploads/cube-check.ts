import { createHash } from 'node:crypto';
import { Transform, type TransformCallback } from 'node:stream';
import { UPLOAD_LIMITS, type UploadSidecar } from '@psiform/contracts';
import { createFloat32FiniteValidator, NrrdError, parseNrrdHeader } from '@psiform/meshing';

/** A refused upload: HTTP status and a message naming the part/field. */
export class UploadRejected extends Error {
  constructor(
    readonly status: 400 | 413,
    message: string,
  ) {
    super(message);
    this.name = 'UploadRejected';
  }
}

const bad = (message: string) => new UploadRejected(400, message);

export interface CubeGeometry {
  sizes: [number, number, number];
  spacing: [number, number, number];
  origin: [number, number, number];
}

export interface CubeCheckResult extends CubeGeometry {
  /** Bytes written to storage (NRRD header + data). */
  bytes: number;
  sha256: string;
}

const MAX_HEADER_BYTES = 65536;

/** Origin that centres the cube on (0, 0, 0) (common practice when a file gives none). */
const centred = (sizes: number[], spacing: number[]) => sizes.map((n, i) => (-(n - 1) * spacing[i]) / 2) as [number, number, number];

/** Validates the sidecar JSON of a raw upload; messages name `sidecar.<field>`. */
export function parseSidecar(text: string): CubeGeometry & { quantity: UploadSidecar['quantity'] } {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch {
    throw bad('sidecar: not valid JSON');
  }
  if (!doc || typeof doc !== 'object' || Array.isArray(doc)) throw bad('sidecar: must be a JSON object');
  const d = doc as Record<string, unknown>;
  const isInt = (v: unknown) => typeof v === 'number' && Number.isInteger(v);
  const fin = (v: unknown) => typeof v === 'number' && Number.isFinite(v);
  const sizes = d.sizes;
  if (!Array.isArray(sizes) || sizes.length !== 3 || !sizes.every((s) => isInt(s) && s >= UPLOAD_LIMITS.sizeMin && s <= UPLOAD_LIMITS.sizeMax)) {
    throw bad(`sidecar.sizes: must be [nx, ny, nz], integers ${UPLOAD_LIMITS.sizeMin}..${UPLOAD_LIMITS.sizeMax}`);
  }
  let spacing: [number, number, number];
  if (fin(d.spacing) && (d.spacing as number) > 0) spacing = [d.spacing as number, d.spacing as number, d.spacing as number];
  else if (Array.isArray(d.spacing) && d.spacing.length === 3 && d.spacing.every((s) => fin(s) && s > 0)) spacing = d.spacing as [number, number, number];
  else throw bad('sidecar.spacing: must be a positive number or [dx, dy, dz] of positive numbers (a0)');
  let origin: [number, number, number];
  if (d.origin === undefined) origin = centred(sizes, spacing);
  else if (Array.isArray(d.origin) && d.origin.length === 3 && d.origin.every(fin)) origin = d.origin as [number, number, number];
  else throw bad('sidecar.origin: must be [x, y, z] of finite numbers (a0)');
  if (d.quantity !== 'psi' && d.quantity !== 'density') throw bad(`sidecar.quantity: must be "psi" or "density"`);
  return { sizes: sizes as [number, number, number], spacing, origin, quantity: d.quantity };
}

/** NRRD0004 header for a little-endian float32 cube (Teem "NRRD file format"). */
export function nrrdHeaderFor(g: CubeGeometry, keyValues: Record<string, string> = {}): Buffer {
  const [dx, dy, dz] = g.spacing;
  const lines = [
    'NRRD0004',
    '# Psiform upload: float32 cube, x fastest; lengths in Bohr radii (a0)',
    'type: float',
    'dimension: 3',
    'space dimension: 3',
    `sizes: ${g.sizes.join(' ')}`,
    `space directions: (${dx},0,0) (0,${dy},0) (0,0,${dz})`,
    `space origin: (${g.origin.join(',')})`,
    'space units: "a0" "a0" "a0"',
    'kinds: domain domain domain',
    'endian: little',
    'encoding: raw',
    ...Object.entries(keyValues).map(([k, v]) => `${k}:=${v}`),
  ];
  return Buffer.from(lines.join('\n') + '\n\n', 'latin1');
}

/** Spacing and origin from a parsed header: axis-aligned space directions, else `spacings`, else 1 a0. */
function geometryOf(h: ReturnType<typeof parseNrrdHeader>): CubeGeometry {
  const sizes = h.sizes as [number, number, number];
  let spacing: number[];
  if (h.spaceDirections) {
    spacing = h.spaceDirections.map((v, i) => {
      if (v.length !== 3 || v.some((c, j) => (j === i ? !(c > 0) : c !== 0))) {
        throw bad('cube: space directions must be axis-aligned with positive spacing, e.g. (h,0,0) (0,h,0) (0,0,h)');
      }
      return v[i];
    });
  } else if (h.fields.spacings) {
    spacing = h.fields.spacings.split(/\s+/).map(Number);
    if (spacing.length !== 3 || !spacing.every((s) => Number.isFinite(s) && s > 0)) throw bad('cube: spacings must be three positive numbers');
  } else {
    spacing = [1, 1, 1];
  }
  let origin: [number, number, number];
  if (h.spaceOrigin) {
    if (h.spaceOrigin.length !== 3) throw bad('cube: space origin must have three components');
    origin = h.spaceOrigin as [number, number, number];
  } else origin = centred(sizes, spacing);
  return { sizes, spacing: spacing as [number, number, number], origin };
}

/**
 * Pass-through check of an uploaded cube while it streams to storage. 'nrrd': the header is read first
 * (float, raw, little endian, dimension 3, sizes 2..512), then the data must have exactly the byte count
 * the header states. 'raw': a NRRD header made from the sidecar is written first, so what is stored is
 * always a NRRD file; the data must be nx·ny·nz·4 bytes. Every value must be a finite float32 (checked
 * across chunk boundaries). Errors are UploadRejected; the stream is destroyed with them.
 */
export class CubeCheck extends Transform {
  private readonly hash = createHash('sha256');
  private readonly finite = createFloat32FiniteValidator(true);
  private bytesOut = 0;
  private dataSeen = 0;
  private expected = -1;
  private headerBuf: Buffer[] = [];
  private headerLen = 0;
  geometry: CubeGeometry | undefined;

  constructor(
    private readonly format: 'nrrd' | 'raw',
    raw?: CubeGeometry,
  ) {
    super();
    if (format === 'raw') {
      if (!raw) throw new Error('raw format needs the sidecar geometry');
      this.geometry = raw;
      this.expected = raw.sizes[0] * raw.sizes[1] * raw.sizes[2] * 4;
      this.out(nrrdHeaderFor(raw));
    }
  }

  result(): CubeCheckResult {
    return { ...this.geometry!, bytes: this.bytesOut, sha256: this.hash.digest('hex') };
  }

  private out(b: Buffer): void {
    if (b.length === 0) return;
    this.hash.update(b);
    this.bytesOut += b.length;
    this.push(b);
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, cb: TransformCallback): void {
    try {
      if (this.expected < 0) {
        this.headerBuf.push(chunk);
        this.headerLen += chunk.length;
        const all = Buffer.concat(this.headerBuf);
        this.headerBuf = [all];
        const end = findHeaderEnd(all);
        if (end < 0) {
          if (this.headerLen > MAX_HEADER_BYTES) throw bad(`cube: not a NRRD file (no blank line ending the header within ${MAX_HEADER_BYTES} bytes)`);
          return cb();
        }
        this.readHeader(all, end);
        this.out(all.subarray(0, end));
        this.headerBuf = [];
        this.data(all.subarray(end));
      } else {
        this.data(chunk);
      }
      cb();
    } catch (err) {
      cb(err as Error);
    }
  }

  override _flush(cb: TransformCallback): void {
    try {
      if (this.expected < 0) throw bad(this.headerLen === 0 ? 'cube: the file is empty' : 'cube: truncated NRRD (the header never ends)');
      if (this.dataSeen !== this.expected) {
        const what = this.format === 'raw' ? `the sidecar sizes ${this.geometry!.sizes.join('x')} need nx·ny·nz·4 = ${this.expected} bytes` : `the header's sizes ${this.geometry!.sizes.join('x')} need ${this.expected} data bytes`;
        throw bad(`cube: truncated: ${this.dataSeen} bytes of data, but ${what}`);
      }
      this.finite.end();
      cb();
    } catch (err) {
      cb(err as Error);
    }
  }

  private readHeader(all: Buffer, dataOffset: number): void {
    // parseNrrdHeader checks the byte count against a known total; while streaming the total is unknown,
    // so we hand it the count the header itself claims and check the real count at the end (_flush).
    const sizesLine = /^sizes:\s*([^\n\r]*)$/im.exec(all.subarray(0, dataOffset).toString('latin1'));
    const claimed = sizesLine ? sizesLine[1].trim().split(/\s+/).map(Number).reduce((a, b) => a * b, 4) : 0;
    let h: ReturnType<typeof parseNrrdHeader>;
    try {
      h = parseNrrdHeader(all, { totalBytes: dataOffset + (Number.isFinite(claimed) ? claimed : 0), maxHeaderBytes: MAX_HEADER_BYTES });
    } catch (err) {
      if (err instanceof NrrdError) throw bad(`cube: ${err.message}`);
      throw err;
    }
    if (h.endian !== 'little') throw bad('cube: endian: only little-endian data is accepted');
    this.geometry = geometryOf(h);
    this.expected = h.dataBytes;
  }

  private data(b: Buffer): void {
    if (b.length === 0) return;
    this.dataSeen += b.length;
    if (this.dataSeen > this.expected) {
      throw bad(`cube: more data than ${this.format === 'raw' ? 'the sidecar sizes' : "the header's sizes"} ${this.geometry!.sizes.join('x')} allow (${this.expected} bytes)`);
    }
    const r = this.finite.push(b);
    if (r.firstBad >= 0) throw bad(`cube: value ${r.firstBad} is not a finite number (NaN or infinity)`);
    this.out(b);
  }
}

/** Offset just past the blank line ending a NRRD header, or -1. */
function findHeaderEnd(b: Buffer): number {
  const lf = b.indexOf('\n\n', 0, 'latin1');
  const crlf = b.indexOf('\n\r\n', 0, 'latin1');
  if (lf < 0 && crlf < 0) return -1;
  if (crlf < 0 || (lf >= 0 && lf < crlf)) return lf + 2;
  return crlf + 3;
}
