export * from './roles';
export * from './states';
export * from './api';
export * from './recipe';
export * from './figures';
export * from './reviews';
export * from './exports';
export * from './print';
