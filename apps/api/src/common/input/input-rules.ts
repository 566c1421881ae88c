/**
 * The rules every string and every nesting level of a request must meet before any code recurses into it or a
 * database sees it (issue "Stays up and stays scoped"): PostgreSQL refuses U+0000 in text and jsonb; a lone UTF-16
 * surrogate has no UTF-8 form (the driver would store U+FFFD instead: not what was sent); C0 control characters
 * other than tab, line feed and carriage return have no place in titles, names, comments or labels; deeply
 * nested documents overflow the stack of recursive validators (a recipe nested 15,000 levels did).
 * Pure functions, iterative walks only, so a hostile document cannot overflow them either.
 */

/** Deepest nesting any request document may have (a recipe needs 5; swatchbooks and exports fewer). */
export const MAX_INPUT_DEPTH = 32;

/** Object keys that would reach Object.prototype when a document is merged into another object. */
const FORBIDDEN_KEYS = new Set(['__proto__', 'constructor', 'prototype']);

/** Why `s` is not acceptable text, or null. */
export function stringProblem(s: string): string | null {
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c >= 0x20 && c < 0x7f) continue; // the common case first
    if (c === 0) return `must not contain NUL characters (U+0000 at character ${i + 1})`;
    if ((c < 0x20 && c !== 0x09 && c !== 0x0a && c !== 0x0d) || c === 0x7f) return `must not contain control characters (U+${hex(c)} at character ${i + 1})`;
    if (c >= 0xd800 && c <= 0xdbff) {
      const next = i + 1 < s.length ? s.charCodeAt(i + 1) : 0;
      if (next >= 0xdc00 && next <= 0xdfff) {
        i++;
        continue;
      }
      return `must be valid Unicode text (lone surrogate U+${hex(c)} at character ${i + 1})`;
    }
    if (c >= 0xdc00 && c <= 0xdfff) return `must be valid Unicode text (lone surrogate U+${hex(c)} at character ${i + 1})`;
  }
  return null;
}

const hex = (c: number) => c.toString(16).toUpperCase().padStart(4, '0');

const join = (path: string, key: string | number) => (path ? `${path}.${key}` : String(key));

/**
 * Every problem in a parsed request document, as `"<field path>: <reason>"` (paths like `recipe.content.terms.0.l`;
 * `root` names the document itself, e.g. "body" when the whole body is the problem). Walks with an explicit stack.
 */
export function inputProblems(value: unknown, root: string, maxDepth = MAX_INPUT_DEPTH, limit = 10): string[] {
  const problems: string[] = [];
  const stack: Array<{ v: unknown; path: string; depth: number }> = [{ v: value, path: '', depth: 0 }];
  while (stack.length && problems.length < limit) {
    const { v, path, depth } = stack.pop()!;
    const name = path || root;
    if (typeof v === 'string') {
      const p = stringProblem(v);
      if (p) problems.push(`${name}: ${p}`);
    } else if (typeof v === 'number') {
      if (!Number.isFinite(v)) problems.push(`${name}: must be a finite number`);
    } else if (v !== null && typeof v === 'object') {
      if (depth >= maxDepth) {
        problems.push(`${name}: nested deeper than ${maxDepth} levels`);
        continue;
      }
      if (Array.isArray(v)) {
        for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: join(path, i), depth: depth + 1 });
      } else {
        const keys = Object.keys(v);
        for (let i = keys.length - 1; i >= 0; i--) {
          const k = keys[i];
          const kp = stringProblem(k);
          if (kp) problems.push(`${name}: field name ${kp}`);
          else if (FORBIDDEN_KEYS.has(k)) problems.push(`${join(path, k)}: field name not allowed`);
          else stack.push({ v: (v as Record<string, unknown>)[k], path: join(path, k), depth: depth + 1 });
        }
      }
    }
  }
  return problems;
}

/**
 * Nesting depth of JSON text, counted without parsing (brackets outside strings), so an over-deep body is refused
 * before JSON.parse or any validator touches it. Returns the depth reached, stopping early past `stopAt`.
 */
export function jsonTextDepth(text: string, stopAt = Infinity): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x7b || c === 0x5b) {
      if (++depth > max && (max = depth) > stopAt) return max;
    } else if (c === 0x7d || c === 0x5d) depth--;
  }
  return max;
}
