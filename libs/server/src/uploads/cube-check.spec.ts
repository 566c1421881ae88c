import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { encodeNrrd } from '@psiform/meshing';
import { CubeCheck, parseSidecar, type CubeCheckResult } from './cube-check';

/** Pushes `bytes` through a CubeCheck in chunks of the given (cycled) sizes; resolves to the output and result. */
async function run(check: CubeCheck, bytes: Buffer, chunkSizes: number[]): Promise<{ out: Buffer; result: CubeCheckResult }> {
  const chunks: Buffer[] = [];
  for (let o = 0, k = 0; o < bytes.length; k++) {
    const n = chunkSizes[k % chunkSizes.length];
    chunks.push(bytes.subarray(o, o + n));
    o += n;
  }
  const parts: Buffer[] = [];
  await new Promise<void>((resolve, reject) => {
    Readable.from(chunks).pipe(check).on('data', (b: Buffer) => parts.push(b)).on('end', resolve).on('error', reject);
  });
  return { out: Buffer.concat(parts), result: check.result() };
}

const cube = (n: number, f: (i: number) => number) => Float32Array.from({ length: n ** 3 }, (_, i) => f(i));
const bytesOf = (a: Float32Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);

describe('CubeCheck', () => {
  it('passes a NRRD through unchanged, in chunks that split values, and reports its geometry and sha256', async () => {
    const file = Buffer.from(encodeNrrd(cube(4, (i) => Math.sin(i)), { sizes: [4, 4, 4], spacing: 0.5, origin: [-0.75, -0.75, -0.75] }));
    const { out, result } = await run(new CubeCheck('nrrd'), file, [3, 7, 5, 1]);
    expect(Buffer.compare(out, file)).toBe(0);
    expect(result).toEqual({ sizes: [4, 4, 4], spacing: [0.5, 0.5, 0.5], origin: [-0.75, -0.75, -0.75], bytes: file.length, sha256: createHash('sha256').update(file).digest('hex') });
  });

  it('finds a NaN whose four bytes straddle a chunk boundary', async () => {
    const data = cube(4, () => 1);
    data[10] = NaN; // bytes 40..43 of the data
    const file = Buffer.from(encodeNrrd(data, { sizes: [4, 4, 4], spacing: 1, origin: [0, 0, 0] }));
    const header = file.indexOf('\n\n') + 2;
    // First chunk ends two bytes into value 10.
    await expect(run(new CubeCheck('nrrd'), file, [header + 42, 5])).rejects.toThrow('cube: value 10 is not a finite number (NaN or infinity)');
  });

  it('raw: prefixes a NRRD header from the sidecar; the byte count must be nx·ny·nz·4', async () => {
    const geometry = { sizes: [2, 3, 4] as [number, number, number], spacing: [1, 2, 3] as [number, number, number], origin: [0, 0, 0] as [number, number, number] };
    const data = bytesOf(Float32Array.from({ length: 24 }, (_, i) => i));
    const { out, result } = await run(new CubeCheck('raw', geometry), data, [13]);
    const text = out.toString('latin1');
    expect(text.startsWith('NRRD0004\n')).toBe(true);
    expect(text).toContain('sizes: 2 3 4\n');
    expect(text).toContain('space directions: (1,0,0) (0,2,0) (0,0,3)\n');
    expect(Buffer.compare(out.subarray(out.indexOf('\n\n') + 2), data)).toBe(0);
    expect(result.bytes).toBe(out.length);
    await expect(run(new CubeCheck('raw', geometry), data.subarray(0, 95), [40])).rejects.toThrow('cube: truncated: 95 bytes of data, but the sidecar sizes 2x3x4 need nx·ny·nz·4 = 96 bytes');
    await expect(run(new CubeCheck('raw', geometry), Buffer.concat([data, data]), [50])).rejects.toThrow('cube: more data than the sidecar sizes 2x3x4 allow (96 bytes)');
  });

  it('refuses a header without an ending, sizes out of range, and a missing endian', async () => {
    await expect(run(new CubeCheck('nrrd'), Buffer.from('NRRD0004\ntype: float\n'), [8])).rejects.toThrow('cube: truncated NRRD (the header never ends)');
    const h = (s: string) => Buffer.from(`NRRD0004\ntype: float\ndimension: 3\nsizes: ${s}\nendian: little\nencoding: raw\n\n`);
    await expect(run(new CubeCheck('nrrd'), h('1 4 4'), [64])).rejects.toThrow(/^cube: sizes: each size must be an integer in 2\.\.512/);
    await expect(run(new CubeCheck('nrrd'), h('513 4 4'), [64])).rejects.toThrow(/^cube: sizes:/);
    await expect(run(new CubeCheck('nrrd'), Buffer.from('NRRD0004\ntype: float\ndimension: 3\nsizes: 2 2 2\nencoding: raw\n\n'), [64])).rejects.toThrow(/^cube: endian:/);
  });
});

describe('parseSidecar', () => {
  it('reads sizes, spacing (one number or three), origin (default: centred) and quantity', () => {
    expect(parseSidecar('{"sizes":[3,5,7],"spacing":0.5,"quantity":"psi"}')).toEqual({ sizes: [3, 5, 7], spacing: [0.5, 0.5, 0.5], origin: [-0.5, -1, -1.5], quantity: 'psi' });
    expect(parseSidecar('{"sizes":[2,2,2],"spacing":[1,2,3],"origin":[1,2,3],"quantity":"density"}')).toMatchObject({ spacing: [1, 2, 3], origin: [1, 2, 3] });
  });

  it('names the bad field', () => {
    expect(() => parseSidecar('{')).toThrow('sidecar: not valid JSON');
    expect(() => parseSidecar('{"sizes":[3,5],"spacing":1,"quantity":"psi"}')).toThrow(/^sidecar\.sizes:/);
    expect(() => parseSidecar('{"sizes":[3,5,1000],"spacing":1,"quantity":"psi"}')).toThrow(/^sidecar\.sizes:/);
    expect(() => parseSidecar('{"sizes":[3,5,7],"spacing":-1,"quantity":"psi"}')).toThrow(/^sidecar\.spacing:/);
    expect(() => parseSidecar('{"sizes":[3,5,7],"spacing":1,"origin":[0,"x",0],"quantity":"psi"}')).toThrow(/^sidecar\.origin:/);
    expect(() => parseSidecar('{"sizes":[3,5,7],"spacing":1,"quantity":"amplitude"}')).toThrow(/^sidecar\.quantity:/);
  });
});
