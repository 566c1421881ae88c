import { DOMParser, type Document, type Element } from '@xmldom/xmldom';

/** Parses SVG text as XML; any warning-free well-formedness error throws. */
export function parseSvg(text: string): Document {
  return new DOMParser({
    onError: (level, msg) => {
      if (level !== 'warning') throw new Error(`XML ${level}: ${msg}`);
    },
  }).parseFromString(text, 'image/svg+xml');
}

export function byClass(doc: Document, tag: string, cls: string): Element[] {
  return Array.from(doc.getElementsByTagName(tag)).filter((e) => (e.getAttribute('class') ?? '').split(/\s+/).includes(cls));
}

/** All (x, y) pairs of an absolute M/L path. */
export function pathPoints(d: string): [number, number][] {
  const out: [number, number][] = [];
  const re = /[ML](-?[\d.]+) (-?[\d.]+)/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(d))) out.push([Number(m[1]), Number(m[2])]);
  return out;
}

export const PALETTE = { positive: '#c8553d', negative: '#2f6690', background: '#fbfaf7', label: '#222222' };
