// Small, dependency-free console helpers for the orchestration scripts.
const useColor = process.stdout.isTTY && !process.env.NO_COLOR;
const paint = (code, s) => (useColor ? `\x1b[${code}m${s}\x1b[0m` : s);
export const log = (msg) => console.log(`${paint('2', '[psiform]')} ${msg}`);
export const ok = (msg) => console.log(`${paint('2', '[psiform]')} ${paint('32', msg)}`);
export const warn = (msg) => console.warn(`${paint('2', '[psiform]')} ${paint('33', msg)}`);
export const fail = (msg) => console.error(`${paint('2', '[psiform]')} ${paint('31', msg)}`);
