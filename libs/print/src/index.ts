// @psiform/print: the print-side pieces shared by the worker, API, CLI and web: export size arithmetic and
// tiling, PNG finishing (pHYs, sRGB) and encoding, the linear -> sRGB pipeline, SVG companions (radial plot,
// section map), the metadata sheet with caption and alt text, and the bundle zip. Pure TypeScript, no I/O.
export * from './size';
export * from './crc32';
export * from './png';
export * from './colour';
export * from './svg-common';
export * from './radial-plot';
export * from './section-map';
export * from './metadata';
export * from './bundle';
export * from './typeset';
export * from './file-names';
export * from './preflight';
export * from './recipe-changes';
export * from './figure-text';
export * from './figure-files';
export * from './svg-fonts';
export * from './phase-key';
