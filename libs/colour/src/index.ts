export * from './hex';
export * from './difference';
export * from './cvd';
export * from './contrast';
export * from './icc';
export * from './press';
export * from './phase-wheel';
export * from './swatchbook-check';
