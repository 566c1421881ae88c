import * as THREE from 'three';
import { recipe2pz } from '../test/figures';
import { placeCamera } from '../scene/framing';
import { commonRadius, intersect, panelGrid, panelViewOffset } from './panels';
import { checkRequest } from './request';

describe('panelGrid', () => {
  it('cuts 2102 × 709 into three cells of one row that tile the canvas exactly', () => {
    const g = panelGrid(2102, 709, 3, 3);
    expect(g.rows).toBe(1);
    expect(g.columns).toBe(3);
    expect(g.cellWidth).toBeCloseTo(700.6667, 4);
    // Edges round(c · 2102/3) = 0, 701, 1401, 2102 (by hand).
    expect(g.cells.map((c) => [c.x, c.width])).toEqual([
      [0, 701],
      [701, 700],
      [1401, 701],
    ]);
    expect(g.cells.every((c) => c.y === 0 && c.height === 709)).toBe(true);
    expect(g.empty).toEqual([]);
  });

  it('five panels in two columns: three rows, the last cell empty, columns capped at the count', () => {
    const g = panelGrid(100, 90, 5, 2);
    expect([g.rows, g.columns]).toEqual([3, 2]);
    expect(g.cells[4]).toMatchObject({ row: 2, col: 0, x: 0, y: 60, width: 50, height: 30 });
    expect(g.empty).toEqual([{ x: 50, y: 60, width: 50, height: 30 }]);
    expect(panelGrid(100, 90, 2, 6).columns).toBe(2);
    const area = g.cells.reduce((a, c) => a + c.width * c.height, 0) + g.empty.reduce((a, c) => a + c.width * c.height, 0);
    expect(area).toBe(100 * 90);
  });

  it('refuses an empty grid', () => {
    expect(() => panelGrid(10, 10, 0, 1)).toThrow(/at least one panel/);
  });
});

describe('panelViewOffset', () => {
  it('windows a tile part of a cell onto the nominal cell centred on the cell centre', () => {
    const g = panelGrid(2102, 709, 3, 3);
    const cell = g.cells[1];
    const sub = intersect(cell, { x: 1000, y: 0, width: 1102, height: 400 })!;
    expect(sub).toEqual({ x: 1000, y: 0, width: 401, height: 400 });
    const [fw, fh, ox, oy, w, h] = panelViewOffset(g, cell, sub);
    expect(fw).toBeCloseTo(2102 / 3, 9);
    expect(fh).toBe(709);
    // Nominal cell 1 starts at 2102/3 = 700.667 px: the tile part starts 299.333 px into it.
    expect(ox).toBeCloseTo(1000 - 2102 / 3, 9);
    expect([oy, w, h]).toEqual([0, 401, 400]);
  });
});

describe('common scale', () => {
  const spec = recipe2pz().stage.camera;

  /** Pixel distance from the cell centre of a point at `d` a0 along the camera's right, in a cell `w` px wide. */
  function pixelsFor(camera: THREE.PerspectiveCamera, d: number, w: number): number {
    const right = new THREE.Vector3().setFromMatrixColumn(camera.matrixWorld, 0).normalize();
    const p = right.multiplyScalar(d).project(camera);
    return (p.x * w) / 2;
  }

  it('a panel whose object has half the extent draws it at the same a0 per pixel (half the pixels)', () => {
    const g = panelGrid(2102, 709, 3, 3);
    const big = 10;
    const small = 5;
    const R = commonRadius([big, small, 7]);
    expect(R).toBe(10);
    const aspect = g.cellWidth / g.cellHeight;
    const camA = new THREE.PerspectiveCamera();
    const camB = new THREE.PerspectiveCamera();
    const fA = placeCamera(camA, spec, R, aspect);
    const fB = placeCamera(camB, spec, R, aspect);
    // Same camera for every panel: same distance and projection, hence the same a0 per pixel.
    expect(camA.position.distanceTo(camB.position)).toBe(0);
    expect(fA.unitsPerPixel(g.cellHeight)).toBe(fB.unitsPerPixel(g.cellHeight));
    const pxBig = pixelsFor(camA, big, g.cellWidth);
    const pxSmall = pixelsFor(camB, small, g.cellWidth);
    expect(pxSmall / pxBig).toBeCloseTo(0.5, 9);
    // At the target plane: pixels = a0 / (a0 per pixel), to 1e-6 px.
    expect(pxBig).toBeCloseTo(big / fA.unitsPerPixel(g.cellHeight), 6);
    // Framing each panel on its own (the wrong way) would draw both objects equally large.
    const camOwn = new THREE.PerspectiveCamera();
    placeCamera(camOwn, spec, small, aspect);
    expect(pixelsFor(camOwn, small, g.cellWidth) / pxBig).toBeCloseTo(1, 9);
  });

  it('a tile window keeps the scale: the same point lands on the same canvas pixel', () => {
    const g = panelGrid(300, 100, 3, 3);
    const cell = g.cells[2];
    const cam = new THREE.PerspectiveCamera();
    placeCamera(cam, spec, 4, g.cellWidth / g.cellHeight);
    const point = new THREE.Vector3().setFromMatrixColumn(cam.matrixWorld, 0).normalize().multiplyScalar(2);
    const whole = point.clone().project(cam);
    const xWhole = cell.cx - g.cellWidth / 2 + ((whole.x + 1) / 2) * g.cellWidth;
    const sub = { x: 250, y: 0, width: 50, height: 100 };
    cam.setViewOffset(...panelViewOffset(g, cell, sub));
    cam.updateProjectionMatrix();
    const inTile = point.clone().project(cam);
    const xTile = sub.x + ((inTile.x + 1) / 2) * sub.width;
    expect(xTile).toBeCloseTo(xWhole, 6);
  });
});

describe('checkRequest with panels', () => {
  const recipe = recipe2pz({ n: 32 });
  const base = { widthPx: 300, heightPx: 100, dpi: 300 };
  it('takes panels and columns; the stage recipe is the first panel', () => {
    const c = checkRequest({ ...base, columns: 3, panels: [{ recipe, glbUrl: '/a.glb', label: '2p_x' }, { recipe, glbUrl: '/b.glb' }] });
    expect(c.panels).toHaveLength(2);
    expect(c.columns).toBe(3);
    expect(c.panels![0].label).toBe('2p_x');
    expect(c.recipe.grid.n).toBe(32);
  });
  it('names the bad field', () => {
    expect(() => checkRequest({ ...base, panels: [] })).toThrow(/panels must list 1 to 12/);
    expect(() => checkRequest({ ...base, panels: [{ recipe, glbUrl: '' }] })).toThrow(/panels\[0\]\.glbUrl/);
    expect(() => checkRequest({ ...base, panels: [{ recipe: { version: 1 }, glbUrl: '/a' }] })).toThrow(/panels\[0\]\.recipe is not valid/);
    expect(() => checkRequest({ ...base, columns: 7, panels: [{ recipe, glbUrl: '/a' }] })).toThrow(/columns must be an integer between 1 and 6/);
    expect(() => checkRequest({ ...base, glbUrl: '/x', panels: [{ recipe, glbUrl: '/a' }] })).toThrow(/not both/);
    expect(() => checkRequest({ ...base, recipe, glbUrl: '/x', columns: 2 })).toThrow(/columns is only used with panels/);
  });
});
