// @psiform/meshing: marching cubes per phase, mesh statistics, encoders (glTF, STL, PLY, OBJ,
// NRRD) and 2D sections. Pure TypeScript on flat typed arrays; no I/O.
export * from './mesh';
export * from './mc-tables';
export * from './marching-cubes';
export * from './stats';
export * from './orbital-surfaces';
export * from './pipeline';
export * from './nodal';
export * from './encoders';
export * from './nrrd';
export * from './sections';
export * from './refine';
export * from './sparse';
export * from './tolerance';
export * from './optimise';
