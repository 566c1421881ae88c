export { default } from './shared/eslint.config.mjs';
