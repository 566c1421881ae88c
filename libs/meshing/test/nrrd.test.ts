import { describe, expect, it } from 'vitest';
import { createFloat32FiniteValidator, encodeNrrd, NrrdError, parseNrrdHeader, validateFloat32Finite } from '../src/nrrd';

// Teem NRRD format (NRRD0004): header lines, blank line, raw data.
const data = new Float32Array(3 * 4 * 5).map((_, i) => i * 0.5 - 3);
const bytes = encodeNrrd(data, { sizes: [3, 4, 5], spacing: 0.25, origin: [-1, -2, -3], keyValues: { model: 'one-electron hydrogen-like', note: 'line1\nline2' } });

describe('NRRD', () => {
  it('round trip: header fields, key:=value lines, data bytes', () => {
    const h = parseNrrdHeader(bytes);
    expect(h.version).toBe(4);
    expect(h.type).toBe('float');
    expect(h.sizes).toEqual([3, 4, 5]);
    expect(h.endian).toBe('little');
    expect(h.spaceDirections).toEqual([[0.25, 0, 0], [0, 0.25, 0], [0, 0, 0.25]]);
    expect(h.spaceOrigin).toEqual([-1, -2, -3]);
    expect(h.spaceUnits).toEqual(['a0', 'a0', 'a0']);
    expect(h.keyValues.model).toBe('one-electron hydrogen-like');
    expect(h.keyValues.note).toBe('line1\nline2');
    expect(h.dataBytes).toBe(60 * 4);
    const back = new Float32Array(bytes.slice(h.dataOffset).buffer);
    expect(Array.from(back)).toEqual(Array.from(data));
    expect(new TextDecoder().decode(bytes.subarray(0, 9))).toBe('NRRD0004\n');
  });

  it('header vs byte count, dimension and size bounds, encoding: errors name the field', () => {
    const err = (b: Uint8Array, lim = {}) => {
      try {
        parseNrrdHeader(b, lim);
      } catch (e) {
        return (e as NrrdError).field;
      }
      return 'none';
    };
    expect(err(bytes.subarray(0, bytes.length - 4))).toBe('data');
    expect(err(bytes, { totalBytes: bytes.length + 1 })).toBe('data');
    expect(err(bytes.subarray(0, parseNrrdHeader(bytes).dataOffset + 8), { totalBytes: bytes.length })).toBe('none'); // prefix + declared total
    expect(err(bytes, { maxSize: 4 })).toBe('sizes');
    const edit = (from: string, to: string) => {
      const t = new TextDecoder('latin1').decode(bytes).replace(from, to);
      return Uint8Array.from(t, (c) => c.charCodeAt(0));
    };
    expect(err(edit('dimension: 3', 'dimension: 2'))).toBe('dimension');
    expect(err(edit('encoding: raw', 'encoding: gzip'))).toBe('encoding');
    expect(err(edit('NRRD0004', 'NRRX0004'))).toBe('magic');
    expect(err(edit('type: float', 'type: double'))).toBe('type');
    expect(err(new TextEncoder().encode('NRRD0004\ntype: float\n'))).toBe('header');
  });

  it('finite check: whole chunks and chunks split at any byte', () => {
    const v = new Float32Array([1, 2, 3, NaN, 5, Infinity]);
    const b = new Uint8Array(v.buffer);
    expect(validateFloat32Finite(b.subarray(0, 12))).toEqual({ count: 3, firstBad: -1 });
    expect(validateFloat32Finite(b).firstBad).toBe(3);
    for (let cut = 1; cut < b.length; cut++) {
      const s = createFloat32FiniteValidator();
      s.push(b.subarray(0, cut));
      const r = s.push(b.subarray(cut));
      expect(r).toEqual({ count: 6, firstBad: 3 });
      expect(s.end().count).toBe(6);
    }
    const s = createFloat32FiniteValidator();
    s.push(b.subarray(0, 5));
    expect(() => s.end()).toThrow(/stray bytes/);
  });
});
