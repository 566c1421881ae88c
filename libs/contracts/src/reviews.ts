import type { JobName, JobOf } from './jobs';
import type { FigureStatus } from './states';
import type { ColourOverrideDto } from './colour-gate';

/** Editorial review and swatchbooks: shapes exchanged over HTTP and through the mail queue. */

export interface SwatchbookColorsDto {
  positive: string;
  negative: string;
  background: string;
  label: string;
  nucleus?: string;
  axes?: string;
  /** OKLCH lightness (0..1) and chroma of the complex-phase wheel. */
  wheel?: { lightness: number; chroma: number };
}

export interface SwatchbookDto {
  id: string;
  name: string;
  ownerId: string;
  /** Its scope: one publication (publisher null), or every publication of a publisher (publicationId null). */
  publicationId: string | null;
  publisher: string | null;
  colors: SwatchbookColorsDto;
  locked: boolean;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface SwatchbookVersionDto {
  version: number;
  name: string;
  colors: SwatchbookColorsDto;
  locked: boolean;
  action: 'create' | 'update' | 'lock' | 'unlock' | 'import';
  authorId: string | null;
  createdAt: string;
}

/** GET /api/swatchbooks/:id/export and the body of POST /api/swatchbooks/import. */
export const SWATCHBOOK_FILE_FORMAT = 'psiform-swatchbook';
export interface SwatchbookFile {
  format: typeof SWATCHBOOK_FILE_FORMAT;
  formatVersion: 1;
  name: string;
  colors: SwatchbookColorsDto;
  exportedAt?: string;
}

export interface SwatchbookWarningDto {
  code: string;
  level: 'warning' | 'error';
  message: string;
  colors: string[];
}

export interface SwatchbookCheckDto {
  figures: {
    phaseDeltaE2000: number;
    phaseDeltaE2000Protan: number;
    phaseDeltaE2000Deutan: number;
    phaseDeltaE2000Tritan: number;
    labelContrast: number;
    [k: string]: unknown;
  };
  warnings: SwatchbookWarningDto[];
}

export interface HouseStyleDto {
  publicationId: string;
  swatchbookId: string;
  swatchbookName: string;
  requireColourSignOff: boolean;
  allowOverride: boolean;
  updatedAt: string;
  /** Set while the pinned swatchbook was pinned past failing colour checks with a written reason. */
  colourOverride: ColourOverrideDto | null;
}

export const REVIEW_ACTIONS = ['submit', 'request_changes', 'revise', 'approve', 'colour_signoff', 'release'] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

/** Answer of every review transition route. `missing` lists what approval still waits for. */
export interface ReviewTransitionDto {
  figureId: string;
  action: ReviewAction;
  fromStatus: FigureStatus;
  status: FigureStatus;
  versionNumber: number;
  missing: ('editor_approval' | 'colour_signoff')[];
  message: string;
}

export interface CommentDto {
  id: string;
  figureId: string;
  versionId: string | null;
  authorId: string;
  authorName?: string;
  body: string;
  pin: { x: number; y: number } | null;
  createdAt: string;
}

export interface AuditEntryDto {
  id: string;
  figureId: string;
  actorId: string | null;
  actorName?: string;
  action: string;
  fromStatus: FigureStatus | null;
  toStatus: FigureStatus | null;
  note: string | null;
  at: string;
}

export interface ReviewDeskItemDto {
  figureId: string;
  title: string;
  /** in_review unless the desk was asked for another state. */
  status: FigureStatus;
  publicationId: string;
  publicationTitle: string;
  versionNumber: number;
  submittedBy: string | null;
  submittedAt: string;
  ageHours: number;
  editorApproved: boolean;
  colourSignedOff: boolean;
  requireColourSignOff: boolean;
}

export interface BatchItemDto {
  figureId: string;
  title: string;
  status: 'queued' | 'skipped';
  reason?: string;
  jobId?: string;
  versionNumber?: number;
  jobState?: string;
}

export interface BatchDto {
  batchId: string;
  publicationId: string;
  swatchbookId: string;
  swatchbookVersion: number;
  total: number;
  completed: number;
  failed: number;
  state: 'running' | 'completed' | 'failed';
  jobs: BatchItemDto[];
  skipped: BatchItemDto[];
  /** The written reason when the swatchbook failed its colour checks and the batch went ahead anyway. */
  overrideReason: string | null;
  createdAt: string;
}

/** Job name on QUEUES.mail; payload MailNoticeJob (the job contract, jobs.ts). */
export const MAIL_NOTICE_JOB = 'notice' satisfies JobName;
export type MailNoticeJob = JobOf<'notice'>;

/** GET /api/dev/outbox rows (newest first). */
export interface OutboxMessageDto {
  subject: string;
  text: string;
  /** The HTML part ('' when the message had none). */
  html: string;
  to: string[];
  receivedAt: string;
}
