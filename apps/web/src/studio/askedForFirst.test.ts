import type { AssetDto } from '@psiform/contracts';
import { askedForFirst } from './ExportDialog';

const asset = (id: string, kind: AssetDto['kind']): AssetDto => ({ id, kind, bytes: 1, sha256: 'x', createdAt: '2026-01-01T00:00:00Z' });

describe('askedForFirst', () => {
  it('puts the requested kind first and keeps the rest in order', () => {
    const list = [asset('a', 'glb'), asset('b', 'stl'), asset('c', 'png')];
    expect(askedForFirst(list, 'png').map((a) => a.id)).toEqual(['c', 'a', 'b']);
    expect(list.map((a) => a.id)).toEqual(['a', 'b', 'c']); // input untouched
  });
  it('leaves the list alone without a requested kind or a match', () => {
    const list = [asset('a', 'glb'), asset('b', 'stl')];
    expect(askedForFirst(list, undefined).map((a) => a.id)).toEqual(['a', 'b']);
    expect(askedForFirst(list, 'svg').map((a) => a.id)).toEqual(['a', 'b']);
  });
});
