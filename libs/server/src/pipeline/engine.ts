/**
 * The engine version: the one place it is defined. It is derived from the versions of the two engine
 * libraries, so a release of either changes it (and with it every content-derived mesh key).
 */
// eslint-disable-next-line @typescript-eslint/no-require-imports -- the libs' package.json is read at run time, outside rootDir
const meshing = require('@psiform/meshing/package.json') as { version: string };
// eslint-disable-next-line @typescript-eslint/no-require-imports -- as above
const orbitals = require('@psiform/orbitals/package.json') as { version: string };

/** Path-safe (used inside storage keys): letters, digits, '.', '-', '_'. */
export const ENGINE_VERSION = `meshing-${meshing.version}_orbitals-${orbitals.version}`;
