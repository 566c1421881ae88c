import { render, screen, within } from '@testing-library/react';
import { checkSwatchbook } from '@psiform/colour';
import { ColourChecks, WARNING_GROUP, groupWarnings } from './ColourChecks';

// Red and green that simulated deuteranopia nearly merges (ΔE00 2.9): an error-level failure of the phase check.
const FAILING = { positive: '#c0392b', negative: '#5a8a2a', background: '#ffffff', label: '#1f1d1a' };

describe('colour checks: warnings under the check that raised them', () => {
  it('every warning code has a group; grouping keeps each warning once', () => {
    const check = checkSwatchbook(FAILING);
    const groups = groupWarnings(check.warnings);
    expect(Object.values(groups).flat()).toHaveLength(check.warnings.length);
    for (const w of check.warnings) expect(WARNING_GROUP[w.code]).toBeDefined();
  });

  it('the deuteranopia failure sits under "Phases told apart", marked as blocking; nothing colour-related under Print', () => {
    render(<ColourChecks check={checkSwatchbook(FAILING)} />);
    const phases = screen.getByTestId('check-warnings-phases');
    const failure = within(phases).getAllByTestId('check-warning').find((w) => w.dataset.level === 'error')!;
    expect(failure.dataset.code).toBe('phases_too_similar');
    expect(failure.textContent).toMatch(/^Blocks pinning and batch re-renders: Positive and negative phases differ by ΔE00 2\.9 under simulated deuteranopia/);
    // The heading just above the phase warnings is the phase check's own.
    expect(phases.previousElementSibling?.previousElementSibling?.previousElementSibling?.textContent).toBe('Phases told apart (CIEDE2000)');
    const print = screen.queryByTestId('check-warnings-print');
    for (const w of print ? within(print).queryAllByTestId('check-warning') : []) expect(w.dataset.code).toBe('out_of_print_gamut');
  });
});
