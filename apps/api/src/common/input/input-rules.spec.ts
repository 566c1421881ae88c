import { MAX_INPUT_DEPTH, inputProblems, jsonTextDepth, stringProblem } from './input-rules';

describe('input rules', () => {
  it('accepts ordinary text, tabs, line breaks, accents and astral characters (surrogate pairs)', () => {
    for (const s of ['2p_z in a cube', 'Ångström\tline\r\nbreak', '3d_z² · sp³ #2', 'ψ lobes 🧪', '']) expect(stringProblem(s)).toBeNull();
  });

  it('names NUL, other control characters and lone surrogates with their position', () => {
    expect(stringProblem('ab\u0000c')).toBe('must not contain NUL characters (U+0000 at character 3)');
    expect(stringProblem('bell\u0007')).toBe('must not contain control characters (U+0007 at character 5)');
    expect(stringProblem('del\u007f')).toBe('must not contain control characters (U+007F at character 4)');
    expect(stringProblem('x\ud800')).toBe('must be valid Unicode text (lone surrogate U+D800 at character 2)');
    expect(stringProblem('\udc00x')).toBe('must be valid Unicode text (lone surrogate U+DC00 at character 1)');
    expect(stringProblem('\ud83e\ud800')).toBe('must be valid Unicode text (lone surrogate U+D83E at character 1)');
  });

  it('reports field paths through objects and arrays', () => {
    const doc = { title: 'ok', recipe: { label: 'a\ud800', content: { terms: [{ n: 1 }, { note: '\u0000' }] } } };
    expect(inputProblems(doc, 'body')).toEqual([
      'recipe.label: must be valid Unicode text (lone surrogate U+D800 at character 2)',
      'recipe.content.terms.1.note: must not contain NUL characters (U+0000 at character 1)',
    ]);
    expect(inputProblems('\u0000', 'q')).toEqual(['q: must not contain NUL characters (U+0000 at character 1)']);
  });

  it('refuses keys that could reach Object.prototype and bad characters in keys', () => {
    expect(inputProblems(JSON.parse('{"a":{"__proto__":{"x":1}}}'), 'body')).toEqual(['a.__proto__: field name not allowed']);
    expect(inputProblems({ ['k\u0000']: 1 }, 'body')).toEqual(['body: field name must not contain NUL characters (U+0000 at character 2)']);
  });

  it('stops at the depth limit without recursing (a 100,000-level document)', () => {
    let deep: unknown = 1;
    for (let i = 0; i < 100000; i++) deep = [deep];
    expect(inputProblems({ recipe: deep }, 'body')).toEqual([`recipe${'.0'.repeat(MAX_INPUT_DEPTH - 1)}: nested deeper than ${MAX_INPUT_DEPTH} levels`]);
    let ok: unknown = 1;
    for (let i = 0; i < MAX_INPUT_DEPTH; i++) ok = [ok];
    expect(inputProblems(ok, 'body')).toEqual([]);
  });

  it('counts JSON nesting in text, ignoring brackets inside strings and escaped quotes', () => {
    expect(jsonTextDepth('{"a":[1,{"b":2}]}')).toBe(3);
    expect(jsonTextDepth('{"a":"[[[[{{{{\\"[[["}')).toBe(1);
    expect(jsonTextDepth('['.repeat(15000) + ']'.repeat(15000))).toBe(15000);
    expect(jsonTextDepth('['.repeat(15000), 40)).toBe(41);
    expect(jsonTextDepth('"just a string"')).toBe(0);
  });
});
