// NRRD writer / header validator. Format: Teem "NRRD file format" (NRRD0004 header: magic line,
// "field: desc" lines, "key:=value" lines, '#' comments, blank line, then the data).

const { min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface NrrdWriteOptions {
  /** Points per axis [nx, ny, nz] (x fastest in the data). */
  sizes: readonly [number, number, number];
  /** Grid spacing in Bohr (same on each axis). */
  spacing: number;
  /** Position of the first sample in Bohr. */
  origin: readonly [number, number, number];
  /** Extra key:=value lines (model convention, rule, grid ...). */
  keyValues?: Record<string, string | number>;
  /** Comment lines (without '#'). */
  comments?: string[];
}

function escapeValue(v: string): string {
  // NRRD key/value escaping: backslash and newline (format spec, "key/value pairs").
  return v.replace(/\\/g, '\\\\').replace(/\n/g, '\\n');
}

function unescapeValue(v: string): string {
  return v.replace(/\\(\\|n)/g, (_m, c: string) => (c === 'n' ? '\n' : '\\'));
}

/** NRRD0004 with type float, encoding raw, endian little, space directions / origin in a0. */
export function encodeNrrd(data: Float32Array, opts: NrrdWriteOptions): Uint8Array {
  const [nx, ny, nz] = opts.sizes;
  for (const [k, v] of [['sizes[0]', nx], ['sizes[1]', ny], ['sizes[2]', nz]] as const) {
    if (!Number.isInteger(v) || v < 1) throw new RangeError(`${k} must be a positive integer`);
  }
  if (data.length !== nx * ny * nz) throw new RangeError(`data length ${data.length} does not match sizes ${nx}x${ny}x${nz}`);
  if (!(opts.spacing > 0) || !Number.isFinite(opts.spacing)) throw new RangeError('spacing must be > 0');
  if (!opts.origin.every(Number.isFinite)) throw new RangeError('origin must be finite');
  const h = opts.spacing;
  const lines = ['NRRD0004'];
  for (const c of opts.comments ?? []) lines.push(`# ${c.replace(/[\r\n]+/g, ' ')}`);
  lines.push(
    'type: float',
    'dimension: 3',
    'space dimension: 3',
    `sizes: ${nx} ${ny} ${nz}`,
    `space directions: (${h},0,0) (0,${h},0) (0,0,${h})`,
    `space origin: (${opts.origin.join(',')})`,
    'space units: "a0" "a0" "a0"',
    'kinds: domain domain domain',
    'endian: little',
    'encoding: raw',
  );
  for (const [k, v] of Object.entries(opts.keyValues ?? {})) {
    if (!/^[^:\n]+$/.test(k)) throw new RangeError(`keyValues key "${k}" must not contain ':' or newlines`);
    lines.push(`${k}:=${escapeValue(String(v))}`);
  }
  const header = new TextEncoder().encode(lines.join('\n') + '\n\n');
  const out = new Uint8Array(header.length + data.length * 4);
  out.set(header, 0);
  const dv = new DataView(out.buffer, header.length);
  for (let i = 0; i < data.length; i++) dv.setFloat32(4 * i, data[i], true);
  return out;
}

const TYPE_SIZES: Record<string, { canonical: string; size: number }> = {};
for (const [names, canonical, size] of [
  [['float'], 'float', 4],
  [['double'], 'double', 8],
  [['uchar', 'unsigned char', 'uint8', 'uint8_t'], 'uchar', 1],
  [['signed char', 'int8', 'int8_t'], 'int8', 1],
  [['short', 'short int', 'signed short', 'signed short int', 'int16', 'int16_t'], 'int16', 2],
  [['ushort', 'unsigned short', 'unsigned short int', 'uint16', 'uint16_t'], 'uint16', 2],
  [['int', 'signed int', 'int32', 'int32_t'], 'int32', 4],
  [['uint', 'unsigned int', 'uint32', 'uint32_t'], 'uint32', 4],
] as const) {
  for (const n of names) TYPE_SIZES[n] = { canonical, size };
}

export class NrrdError extends Error {
  constructor(
    message: string,
    readonly field: string,
  ) {
    super(message);
    this.name = 'NrrdError';
  }
}

export interface NrrdHeader {
  version: number;
  type: string;
  typeSize: number;
  dimension: number;
  sizes: number[];
  encoding: string;
  endian: 'little' | 'big' | null;
  spaceDirections: number[][] | null;
  spaceOrigin: number[] | null;
  spaceUnits: string[] | null;
  fields: Record<string, string>;
  keyValues: Record<string, string>;
  /** Byte offset of the data (just after the blank line). */
  dataOffset: number;
  /** Bytes the data must have: product(sizes) * typeSize (raw encoding). */
  dataBytes: number;
}

export interface NrrdLimits {
  /** Allowed dimension range (default exactly 3). */
  minDimension?: number;
  maxDimension?: number;
  /** Largest size of any axis (default 512). */
  maxSize?: number;
  /** Smallest size of any axis (default 2). */
  minSize?: number;
  /** Largest header in bytes (default 64 KiB). */
  maxHeaderBytes?: number;
  /** Accepted types (canonical names; default ['float']). */
  types?: string[];
  /** Total byte count of the whole file, when bytes holds only its beginning (streaming). */
  totalBytes?: number;
}

function vec(s: string, field: string): number[] {
  const m = s.trim().match(/^\(([^)]*)\)$/);
  if (!m) throw new NrrdError(`${field}: expected a vector like (x,y,z), got "${s}"`, field);
  const v = m[1].split(',').map((x) => Number(x.trim()));
  if (!v.every(Number.isFinite)) throw new NrrdError(`${field}: non-numeric component in "${s}"`, field);
  return v;
}

/**
 * Parse and validate a NRRD header from the start of a file. Checks the magic, required fields,
 * dimension and size bounds, type, encoding (raw only), and that the byte count after the header
 * equals product(sizes) * type size (for the whole file: bytes.length, or limits.totalBytes when
 * only a prefix is at hand). Throws NrrdError naming the field.
 */
export function parseNrrdHeader(bytes: Uint8Array, limits: NrrdLimits = {}): NrrdHeader {
  const maxHeader = limits.maxHeaderBytes ?? 65536;
  const scan = bytes.subarray(0, min(bytes.length, maxHeader + 2));
  let end = -1;
  let dataOffset = -1;
  for (let i = 0; i + 1 < scan.length; i++) {
    if (scan[i] === 0x0a && scan[i + 1] === 0x0a) {
      end = i;
      dataOffset = i + 2;
      break;
    }
    if (scan[i] === 0x0a && scan[i + 1] === 0x0d && scan[i + 2] === 0x0a) {
      end = i;
      dataOffset = i + 3;
      break;
    }
  }
  if (end < 0) throw new NrrdError(`header: no blank line ending the header within ${maxHeader} bytes`, 'header');
  const text = new TextDecoder('utf-8', { fatal: false }).decode(scan.subarray(0, end));
  const lines = text.split(/\r?\n/);
  const magic = lines[0].match(/^NRRD000([1-5])$/);
  if (!magic) throw new NrrdError('magic: file does not start with NRRD0001..NRRD0005', 'magic');
  const fields: Record<string, string> = {};
  const keyValues: Record<string, string> = {};
  for (const line of lines.slice(1)) {
    if (line.startsWith('#') || line === '') continue;
    const kv = line.indexOf(':=');
    const fd = line.indexOf(': ');
    if (kv >= 0 && (fd < 0 || kv < fd)) {
      keyValues[line.slice(0, kv)] = unescapeValue(line.slice(kv + 2));
    } else if (fd >= 0) {
      const name = line.slice(0, fd).trim().toLowerCase();
      if (name in fields) throw new NrrdError(`${name}: field given twice`, name);
      fields[name] = line.slice(fd + 2).trim();
    } else {
      throw new NrrdError(`header: unreadable line "${line.slice(0, 60)}"`, 'header');
    }
  }
  for (const req of ['type', 'dimension', 'sizes', 'encoding']) {
    if (!(req in fields)) throw new NrrdError(`${req}: required field missing`, req);
  }
  const t = TYPE_SIZES[fields.type.toLowerCase()];
  if (!t) throw new NrrdError(`type: unsupported type "${fields.type}"`, 'type');
  const types = limits.types ?? ['float'];
  if (!types.includes(t.canonical)) throw new NrrdError(`type: "${fields.type}" not accepted (allowed: ${types.join(', ')})`, 'type');
  const dimension = Number(fields.dimension);
  const minD = limits.minDimension ?? 3;
  const maxD = limits.maxDimension ?? 3;
  if (!Number.isInteger(dimension) || dimension < minD || dimension > maxD) {
    throw new NrrdError(`dimension: must be an integer in ${minD}..${maxD}, got "${fields.dimension}"`, 'dimension');
  }
  const sizes = fields.sizes.split(/\s+/).map(Number);
  const maxSize = limits.maxSize ?? 512;
  const minSize = limits.minSize ?? 2;
  if (sizes.length !== dimension) throw new NrrdError(`sizes: ${sizes.length} values for dimension ${dimension}`, 'sizes');
  for (const s of sizes) {
    if (!Number.isInteger(s) || s < minSize || s > maxSize) throw new NrrdError(`sizes: each size must be an integer in ${minSize}..${maxSize}, got "${fields.sizes}"`, 'sizes');
  }
  const encoding = fields.encoding.toLowerCase();
  if (encoding !== 'raw') throw new NrrdError(`encoding: only raw is accepted, got "${fields.encoding}"`, 'encoding');
  let endian: 'little' | 'big' | null = null;
  if ('endian' in fields) {
    const e = fields.endian.toLowerCase();
    if (e !== 'little' && e !== 'big') throw new NrrdError(`endian: must be little or big, got "${fields.endian}"`, 'endian');
    endian = e;
  } else if (t.size > 1) {
    throw new NrrdError('endian: required for multi-byte types', 'endian');
  }
  if ('data file' in fields || 'datafile' in fields) throw new NrrdError('data file: detached data is not accepted', 'data file');
  let spaceDirections: number[][] | null = null;
  if ('space directions' in fields) {
    const parts = fields['space directions'].match(/\([^)]*\)|none/g) ?? [];
    if (parts.length !== dimension) throw new NrrdError(`space directions: ${parts.length} vectors for dimension ${dimension}`, 'space directions');
    spaceDirections = parts.map((p) => (p === 'none' ? [] : vec(p, 'space directions')));
  }
  const spaceOrigin = 'space origin' in fields ? vec(fields['space origin'], 'space origin') : null;
  const spaceUnits = 'space units' in fields ? (fields['space units'].match(/"[^"]*"/g) ?? []).map((s) => s.slice(1, -1)) : null;
  const dataBytes = sizes.reduce((a, b) => a * b, 1) * t.size;
  const total = limits.totalBytes ?? bytes.length;
  if (total - dataOffset !== dataBytes) {
    throw new NrrdError(`data: expected ${dataBytes} bytes after the header (sizes x ${t.size}), found ${total - dataOffset}`, 'data');
  }
  return {
    version: Number(magic[1]),
    type: t.canonical,
    typeSize: t.size,
    dimension,
    sizes,
    encoding,
    endian,
    spaceDirections,
    spaceOrigin,
    spaceUnits,
    fields,
    keyValues,
    dataOffset,
    dataBytes,
  };
}

export interface FiniteCheck {
  /** Float32 values checked. */
  count: number;
  /** Index (within the values checked so far) of the first NaN or infinity, or -1. */
  firstBad: number;
}

/**
 * True/false check that a chunk of little-endian float32 bytes holds only finite values
 * (exponent bits not all ones, IEEE 754 binary32). chunk.length must be a multiple of 4; for
 * arbitrary chunk boundaries use createFloat32FiniteValidator.
 */
export function validateFloat32Finite(chunk: Uint8Array, littleEndian = true): FiniteCheck {
  if (chunk.length % 4 !== 0) throw new RangeError(`chunk length ${chunk.length} is not a multiple of 4`);
  const n = chunk.length / 4;
  const dv = new DataView(chunk.buffer, chunk.byteOffset, chunk.byteLength);
  for (let i = 0; i < n; i++) {
    if ((dv.getUint32(4 * i, littleEndian) & 0x7f800000) === 0x7f800000) return { count: n, firstBad: i };
  }
  return { count: n, firstBad: -1 };
}

/** Streaming form: push chunks of any length; carries the 0-3 bytes split across chunks. */
export function createFloat32FiniteValidator(littleEndian = true): {
  push(chunk: Uint8Array): FiniteCheck;
  end(): FiniteCheck;
} {
  const carry = new Uint8Array(4);
  let carried = 0;
  let count = 0;
  let firstBad = -1;
  return {
    push(chunk: Uint8Array): FiniteCheck {
      let off = 0;
      if (carried > 0) {
        while (carried < 4 && off < chunk.length) carry[carried++] = chunk[off++];
        if (carried === 4) {
          const r = validateFloat32Finite(carry, littleEndian);
          if (r.firstBad >= 0 && firstBad < 0) firstBad = count;
          count++;
          carried = 0;
        }
      }
      const whole = (chunk.length - off) & ~3;
      if (whole > 0) {
        const r = validateFloat32Finite(chunk.subarray(off, off + whole), littleEndian);
        if (r.firstBad >= 0 && firstBad < 0) firstBad = count + r.firstBad;
        count += r.count;
      }
      for (let i = off + whole; i < chunk.length; i++) carry[carried++] = chunk[i];
      return { count, firstBad };
    },
    end(): FiniteCheck {
      if (carried !== 0) throw new RangeError(`data ends with ${carried} stray bytes (not a whole float32)`);
      return { count, firstBad };
    },
  };
}
