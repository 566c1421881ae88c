// `npm run lint` (and the lint suite of `npm test`): ESLint over the sources with shared/eslint.config.mjs.
// Prints the problems, then "N files checked, N with errors"; exits 1 when any file has an error (warnings pass).
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ESLint } from 'eslint';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
// Every workspace's sources (from package.json, so a new workspace is linted too), the scripts and browser tests.
const { workspaces } = JSON.parse(readFileSync(path.join(root, 'package.json'), 'utf8'));
const TARGETS = [...workspaces.map((w) => `${w}/src`), 'scripts', 'test/e2e'];
const eslint = new ESLint({ cwd: root });
const results = await eslint.lintFiles(TARGETS);
const formatter = await eslint.loadFormatter('stylish');
const text = await formatter.format(results);
if (text.trim()) console.log(text);
const withErrors = results.filter((r) => r.errorCount > 0).length;
console.log(`lint: ${results.length} files checked, ${withErrors} with errors`);
process.exit(withErrors > 0 ? 1 : 0);
