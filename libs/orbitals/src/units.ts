/**
 * Length units. Everything in this library works in atomic units: lengths in Bohr radii (a0),
 * nuclear charge Z of a one-electron (hydrogen-like) ion. Branded types stop a raw Angstrom value
 * from being passed where Bohr is expected.
 */
export type Bohr = number & { readonly __unit: 'Bohr' };
export type Angstrom = number & { readonly __unit: 'Angstrom' };

/** Bohr radius in Angstrom: a0 = 0.529177210903(80) Å, CODATA 2018 recommended value (NIST, Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)). */
export const BOHR_RADIUS_ANGSTROM = 0.529177210903;
/** Alias: a0 expressed in Angstrom. */
export const a0 = BOHR_RADIUS_ANGSTROM;

export function bohr(x: number): Bohr {
  return x as Bohr;
}

export function angstrom(x: number): Angstrom {
  return x as Angstrom;
}

export function bohrToAngstrom(x: Bohr): Angstrom {
  return (x * BOHR_RADIUS_ANGSTROM) as Angstrom;
}

export function angstromToBohr(x: Angstrom): Bohr {
  return (x / BOHR_RADIUS_ANGSTROM) as Bohr;
}
