/**
 * CRC-32 as the PNG specification requires (§5.5, the ISO 3309 / ITU-T V.42 polynomial, reflected
 * 0xEDB88320, initial and final XOR 0xFFFFFFFF). Our own 1 KiB table because the libs run in browsers
 * and Web Workers too: zlib.crc32 is a Node API, and fflate does not export its internal CRC.
 */
const TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** Running update: crc32(b, crc32(a)) equals crc32(a ++ b). */
export function crc32(bytes: Uint8Array, previous = 0): number {
  let c = (previous ^ 0xffffffff) >>> 0;
  for (let i = 0; i < bytes.length; i++) c = TABLE[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}
