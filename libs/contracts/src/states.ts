/** Proof states of a figure (see ../shared/architecture.md, "Proof states"). */
export const FIGURE_STATUSES = ['draft', 'in_review', 'changes_requested', 'approved', 'released'] as const;
export type FigureStatus = (typeof FIGURE_STATUSES)[number];

export const FIGURE_STATUS_LABELS: Record<FigureStatus, string> = {
  draft: 'Draft',
  in_review: 'In review',
  changes_requested: 'Changes requested',
  approved: 'Approved',
  released: 'Released',
};

/** Job states as reported by the API. */
export const JOB_STATES = ['queued', 'active', 'completed', 'failed'] as const;
export type JobState = (typeof JOB_STATES)[number];

/** Queue and job names shared by api and worker. */
export const QUEUES = {
  health: 'psiform-health',
  mesh: 'psiform-mesh',
  render: 'psiform-render',
  /** SVG, GLB/STL hand-over and bundle exports (studio issue). */
  export: 'psiform-export',
  mail: 'psiform-mail',
} as const;

export const ASSET_KINDS = ['glb', 'stl', 'ply', 'obj', 'nrrd', 'png', 'svg', 'bundle', 'tiff', 'pdf', 'softproof'] as const;
export type AssetKind = (typeof ASSET_KINDS)[number];
