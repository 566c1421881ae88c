export * from './hex';
export * from './difference';
export * from './cvd';
export * from './contrast';
export * from './print-gamut';
export * from './phase-wheel';
export * from './swatchbook-check';
export * from './phase-colour';
