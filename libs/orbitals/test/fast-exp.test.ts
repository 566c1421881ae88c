import { describe, expect, it } from 'vitest';
import { expNonPositive } from '../src/fast-exp';

describe('expNonPositive: e^x for x <= 0 against Math.exp', () => {
  it('exact at 0, and at the ends of the range', () => {
    expect(expNonPositive(0)).toBe(1);
    expect(expNonPositive(-0)).toBe(1);
    expect(expNonPositive(-800)).toBe(0);
    expect(expNonPositive(-Infinity)).toBe(0);
    expect(expNonPositive(NaN)).toBeNaN();
  });

  it('within 4 ulp (relative 1e-15) of Math.exp from -700 to 0, including table boundaries j ln2 / 64', () => {
    const xs: number[] = [];
    for (let i = 0; i <= 200000; i++) xs.push(-700 * (i / 200000) ** 2);
    for (let j = 0; j <= 640; j++) xs.push((-j * Math.LN2) / 64, (-j * Math.LN2) / 64 + 1e-12, (-j * Math.LN2) / 64 - 1e-12, (-(j + 0.5) * Math.LN2) / 64);
    let worst = 0;
    for (const x of xs) worst = Math.max(worst, Math.abs(expNonPositive(x) / Math.exp(x) - 1));
    expect(worst).toBeLessThan(1e-15);
  });

  it('hand values: e^-1 and e^-10 (e = 2.718281828459045...)', () => {
    expect(Math.abs(expNonPositive(-1) - 0.36787944117144233) / 0.36787944117144233).toBeLessThan(1e-15);
    expect(Math.abs(expNonPositive(-10) - 4.5399929762484854e-5) / 4.5399929762484854e-5).toBeLessThan(1e-15);
  });
});
