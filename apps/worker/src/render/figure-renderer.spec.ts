import { PNG } from 'pngjs';
import { encodeRgbaPng, finishPng } from '@psiform/print';
import { checkPng } from './figure-renderer';

const rgba = (w: number, h: number) => new Uint8Array(w * h * 4).fill(200);

describe('checkPng', () => {
  it('accepts the exact size with pHYs in pixels per metre (300 dpi = 11811, PNG spec §11.3.5.3) and sRGB', () => {
    expect(() => checkPng(encodeRgbaPng(7, 5, rgba(7, 5), { dpi: 300 }), 7, 5, 300)).not.toThrow();
  });

  it('refuses a wrong size or resolution, naming what is wrong', () => {
    const png = encodeRgbaPng(7, 5, rgba(7, 5), { dpi: 300 });
    expect(() => checkPng(png, 8, 5, 300)).toThrow('size 7 × 5 px, expected 8 × 5');
    expect(() => checkPng(png, 7, 5, 600)).toThrow('expected 23622 px/m on both axes');
  });

  it('a PNG without pHYs/sRGB (pngjs) fails until finishPng stamps them', () => {
    const p = new PNG({ width: 4, height: 3 });
    p.data.fill(255);
    const plain = new Uint8Array(PNG.sync.write(p));
    expect(() => checkPng(plain, 4, 3, 300)).toThrow(/pHYs null.*no sRGB chunk/);
    expect(() => checkPng(finishPng(plain, { dpi: 1200 }), 4, 3, 1200)).not.toThrow();
  });
});
