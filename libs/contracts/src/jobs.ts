import { z } from 'zod';
import { SECTION_PLANES } from './exports';
import { COLOUR_MODES, PRESS_CONDITION_IDS, deliveryProfileSchema } from './print';
import { QUEUES } from './states';

/**
 * The one job contract between the api and the worker: every job name, the queue it runs on and the ONE zod schema
 * of its payload. A producer can only build a payload of the declared type (`JobOf<'render'>`), the worker's runner
 * parses every payload with the same schema before a handler sees it, so no processor casts its data.
 * (Modelled on immich's server/src/types.ts `JobItem` union and its job repository's start-up check.)
 *
 * To add a job kind: one entry in JOB_SCHEMAS and JOB_QUEUE here, one handler in apps/worker (DEVELOPERS.md "Jobs").
 */

const uuid = z.guid({ message: 'must be a UUID' });
const positiveInt = z.number().int().positive();

/** Mesh jobs need nothing beyond the figure version their Job row names. */
export const meshParamsSchema = z.object({}).strict();

/** The colour of a print file (TIFF, PDF): from the request, else the publication's delivery profile. */
const printColour = { colour: z.enum(COLOUR_MODES).optional(), pressCondition: z.enum(PRESS_CONDITION_IDS).optional() };
/** The publication's delivery profile when the export was asked for: the worker preflights against this copy. */
const profile = { profile: deliveryProfileSchema.optional() };

/** A raster render: a print PNG or TIFF, a thumbnail, or a figure set's panels (one image). */
export const renderParamsSchema = z
  .object({
    /** tiff: rendered as the PNG is, then written as TIFF (RGB + sRGB, or CMYK through the press profile). */
    format: z.enum(['png', 'tiff']),
    ...printColour,
    alpha: z.boolean().optional(),
    ...profile,
    widthPx: positiveInt,
    heightPx: positiveInt,
    dpi: z.number().positive(),
    widthMm: z.number().positive().optional(),
    heightMm: z.number().positive().optional(),
    /** null/absent: the recipe's stage.background.transparent. */
    transparent: z.boolean().nullable().optional(),
    /** A 320 × 240 screen image after a mesh job (THUMBNAIL). */
    thumbnail: z.boolean().optional(),
    afterMeshJob: uuid.optional(),
    /** Figure sets: the set and the member versions pinned when the export was asked for. */
    figureSetId: uuid.optional(),
    columns: positiveInt.optional(),
    title: z.string().optional(),
    /** Printed under the set's panels. */
    caption: z.string().nullable().optional(),
    panels: z.array(z.object({ figureId: uuid, figureVersionId: uuid }).strict()).optional(),
  })
  .strict();

/** A plot companion (radial plot or section map) as SVG or PDF. */
const plot = {
  kind: z.enum(['radial', 'section']),
  plane: z.enum(SECTION_PLANES),
  offset: z.number(),
  levels: positiveInt,
  widthMm: z.number().positive(),
  heightMm: z.number().positive(),
};

/** Plot companions (SVG, PDF), mesh hand-over and bundles (png and tiff are render jobs). A new format: one line here. */
export const exportParamsSchema = z.discriminatedUnion('format', [
  z.object({ format: z.literal('svg'), ...plot, ...profile }).strict(),
  z.object({ format: z.literal('pdf'), ...plot, ...printColour, ...profile }).strict(),
  z.object({ format: z.enum(['glb', 'stl']), ...profile }).strict(),
  z.object({ format: z.literal('bundle'), ...profile }).strict(),
]);

export type MeshParams = z.infer<typeof meshParamsSchema>;
export type RenderParams = z.infer<typeof renderParamsSchema>;
export type ExportParams = z.infer<typeof exportParamsSchema>;

/** Jobs that have a row in the jobs table (state, stage, progress, assets); the payload names the row. */
const tracked = <P extends z.ZodType>(params: P) => z.object({ jobId: uuid, params }).strict();

export const JOB_SCHEMAS = {
  /** Health check: answers which worker process took it. */
  ping: z.object({}).strict(),
  mesh: tracked(meshParamsSchema),
  render: tracked(renderParamsSchema),
  export: tracked(exportParamsSchema),
  /** A review notice; the BullMQ job id is its outbox row id (delivered once). */
  notice: z
    .object({
      to: z.array(z.email({ message: 'must be an e-mail address' })).min(1),
      subject: z.string().min(1),
      text: z.string(),
      html: z.string(),
    })
    .strict(),
} as const;

export type JobName = keyof typeof JOB_SCHEMAS;
export const JOB_NAMES = Object.keys(JOB_SCHEMAS) as JobName[];

/** Every job as a tagged union: `{ name: 'render', data: { jobId, params: RenderParams } } | …`. */
export type JobItem = { [N in JobName]: { name: N; data: z.infer<(typeof JOB_SCHEMAS)[N]> } }[JobName];
/** The payload of one job name. */
export type JobOf<N extends JobName> = Extract<JobItem, { name: N }>['data'];

/** Job names with a row in the jobs table (JobDto.type). */
export const TRACKED_JOBS = ['mesh', 'render', 'export'] as const satisfies readonly JobName[];
export type TrackedJobName = (typeof TRACKED_JOBS)[number];
export const isTrackedJob = (name: JobName): name is TrackedJobName => (TRACKED_JOBS as readonly string[]).includes(name);

/** The queue each job runs on (a queue may carry several names; the runner dispatches by name). */
export const JOB_QUEUE: Record<JobName, (typeof QUEUES)[keyof typeof QUEUES]> = {
  ping: QUEUES.health,
  mesh: QUEUES.mesh,
  render: QUEUES.render,
  export: QUEUES.export,
  notice: QUEUES.mail,
};

export type JobParse<N extends JobName> = { ok: true; data: JobOf<N> } | { ok: false; message: string };

/** Checks a payload against its job's schema; the message names each bad field (`params.widthPx: …`). */
export function parseJob<N extends JobName>(name: N, data: unknown): JobParse<N> {
  const r = JOB_SCHEMAS[name].safeParse(data);
  if (r.success) return { ok: true, data: r.data as JobOf<N> };
  return { ok: false, message: `malformed ${name} job: ${r.error.issues.map((i) => `${i.path.join('.') || '(payload)'}: ${i.message}`).join('; ')}` };
}

export const isJobName = (name: string): name is JobName => Object.prototype.hasOwnProperty.call(JOB_SCHEMAS, name);
