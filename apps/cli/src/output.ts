import * as fs from 'node:fs';
import * as path from 'node:path';
import { randomBytes } from 'node:crypto';
import { UsageError } from './errors';

const live = new Set<string>();
let hooked = false;

function hookCleanup(): void {
  if (hooked) return;
  hooked = true;
  const clean = () => {
    for (const f of live) {
      try {
        fs.unlinkSync(f);
      } catch {
        /* already gone */
      }
    }
    live.clear();
  };
  process.on('exit', clean);
  for (const sig of ['SIGINT', 'SIGTERM'] as const) {
    process.once(sig, () => {
      clean();
      process.exit(130);
    });
  }
}

/**
 * Checks before any long computation that FILE can be written, and that its extension is one we know,
 * so a bad --out fails fast with exit 2 instead of after sampling.
 */
export function checkOutPath(file: string, allowed: readonly string[]): string {
  const ext = path.extname(file).toLowerCase();
  if (!allowed.includes(ext)) {
    throw new UsageError(`--out must end in ${allowed.join(', ')} (got '${file}')`);
  }
  const dir = path.dirname(path.resolve(file));
  let st: fs.Stats;
  try {
    st = fs.statSync(dir);
  } catch {
    throw new UsageError(`cannot write '${file}': folder '${dir}' does not exist`);
  }
  if (!st.isDirectory()) throw new UsageError(`cannot write '${file}': '${dir}' is not a folder`);
  try {
    fs.accessSync(dir, fs.constants.W_OK);
  } catch {
    throw new UsageError(`cannot write '${file}': folder '${dir}' is not writable`);
  }
  try {
    if (fs.statSync(file).isDirectory()) throw new UsageError(`cannot write '${file}': it is a folder`);
  } catch (e) {
    if (e instanceof UsageError) throw e;
  }
  return ext;
}

/** Writes to a temporary name beside FILE and renames only once everything is on disk (no partial files). */
export function writeFileAtomic(file: string, chunks: Uint8Array | readonly Uint8Array[]): number {
  hookCleanup();
  const abs = path.resolve(file);
  const tmp = path.join(path.dirname(abs), `.${path.basename(abs)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  live.add(tmp);
  let fd: number | undefined;
  let bytes = 0;
  try {
    fd = fs.openSync(tmp, 'wx');
    for (const c of Array.isArray(chunks) ? chunks : [chunks as Uint8Array]) {
      let off = 0;
      while (off < c.byteLength) off += fs.writeSync(fd, c, off, c.byteLength - off);
      bytes += c.byteLength;
    }
    fs.fsyncSync(fd);
    fs.closeSync(fd);
    fd = undefined;
    fs.renameSync(tmp, abs);
    live.delete(tmp);
    return bytes;
  } catch (err) {
    if (fd !== undefined) fs.closeSync(fd);
    try {
      fs.unlinkSync(tmp);
    } catch {
      /* never created */
    }
    live.delete(tmp);
    throw new UsageError(`cannot write '${file}': ${(err as Error).message}`, 1);
  }
}
