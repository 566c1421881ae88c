import { converter, differenceCiede2000 } from 'culori';
import { parseHex } from './hex';

const ciede2000 = differenceCiede2000();
const lab65 = converter('lab65');

/**
 * CIEDE2000 colour difference (Sharma, Wu & Dalal 2005, Color Res. Appl. 30(1)) computed by culori.
 * The sRGB colours are converted to CIELAB under D65 (culori mode `lab65`; its `lab` is D50), so no
 * chromatic adaptation is involved for sRGB's D65 white.
 */
export function deltaE2000(hexA: string, hexB: string): number {
  return ciede2000(lab65(parseHex(hexA)), lab65(parseHex(hexB)));
}
