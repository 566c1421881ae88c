import { randomUUID } from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import type { Readable } from 'node:stream';
import { BadRequestException, HttpException, Inject, Injectable, PayloadTooLargeException } from '@nestjs/common';
import busboy from 'busboy';
import { RECIPE_LIMITS, RECIPE_VERSION, UPLOAD_FORMATS, type Recipe, type UploadFormat, type UploadResponse, type UserDto } from '@psiform/contracts';
import { APP_CONFIG, type AppConfig, ObjectStorage, AssetStore, FiguresStore, uploadKey, uploadTempKey, CubeCheck, parseSidecar, UploadRejected, type CubeCheckResult, type CubeGeometry } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';
import { FiguresService } from '../figures/figures.service';
import { FIGURE_TITLE_MAX } from '../figures/figures.dto';
import { validateRecipe } from '../figures/recipe-input';

type Caller = Pick<UserDto, 'id' | 'role'>;
type Sidecar = ReturnType<typeof parseSidecar>;

const SIDECAR_MAX_BYTES = 65536;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function toHttp(err: unknown): HttpException {
  if (err instanceof HttpException) return err;
  if (err instanceof UploadRejected) return err.status === 413 ? new PayloadTooLargeException(err.message) : new BadRequestException(err.message);
  return new BadRequestException(`upload failed: ${(err as Error).message}`);
}

/**
 * POST /api/uploads: a float32 cube (NRRD, or raw + sidecar) becomes a figure whose recipe takes its field
 * from the upload. The cube streams through CubeCheck into storage under a temporary key (never whole in
 * memory); any failure deletes that object and stores no rows. Success copies it to a content-derived key.
 */
@Injectable()
export class UploadsService {
  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    private readonly storage: ObjectStorage,
    private readonly membership: MembershipService,
    private readonly assets: AssetStore,
    private readonly figuresStore: FiguresStore,
    private readonly figures: FiguresService,
  ) {}

  receive(user: Caller, req: IncomingMessage): Promise<UploadResponse> {
    type Stored = UploadResponse & { key: string };
    const type = req.headers['content-type'] ?? '';
    if (!/^multipart\/form-data/i.test(type)) {
      req.resume();
      return Promise.reject(new BadRequestException('the upload must be multipart/form-data (parts: publicationId, title, format, [sidecar], cube)'));
    }
    const maxBytes = this.config.uploads.maxBytes;
    return new Promise<UploadResponse>((resolve, reject) => {
      let bb: busboy.Busboy;
      try {
        bb = busboy({ headers: req.headers, limits: { fileSize: maxBytes, files: 2, fields: 10, fieldSize: 4096, parts: 12 } });
      } catch (err) {
        req.resume();
        reject(new BadRequestException(`malformed multipart request: ${(err as Error).message}`));
        return;
      }
      const fields: Record<string, string> = {};
      let sidecar: Promise<Sidecar> | undefined;
      let work: Promise<Stored> | undefined;
      let failure: unknown;
      const fail = (err: unknown) => (failure ??= err);

      bb.on('field', (name, value, info) => {
        if (work) return fail(new BadRequestException(`field ${name}: must come before the cube part`));
        if (info.valueTruncated) return fail(new BadRequestException(`${name}: value too long`));
        fields[name] = value;
      });
      bb.on('file', (name, stream) => {
        if (name === 'sidecar' && !work) {
          sidecar = readSmall(stream, SIDECAR_MAX_BYTES).then(parseSidecar);
          sidecar.catch(fail);
        } else if (name === 'cube' && !work && failure === undefined) {
          work = this.storeCube(user, fields, sidecar, stream);
          work.catch(fail);
        } else {
          stream.resume();
          fail(new BadRequestException(name === 'cube' || name === 'sidecar' ? `${name}: part given twice or out of order` : `unexpected file part "${name}" (expected sidecar, cube)`));
        }
      });
      bb.on('partsLimit', () => fail(new BadRequestException('too many parts in the upload')));
      bb.on('filesLimit', () => fail(new BadRequestException('too many files in the upload (expected sidecar, cube)')));
      bb.on('fieldsLimit', () => fail(new BadRequestException('too many fields in the upload')));
      bb.on('error', (err: Error) => {
        fail(new BadRequestException(`malformed multipart request: ${err.message}`));
        req.unpipe(bb);
        req.resume();
        void settle();
      });
      const settle = async () => {
        const result = work ? await work.catch((e) => (fail(e), undefined)) : undefined;
        if (!work && failure === undefined) fail(new BadRequestException('cube: the file part is missing'));
        if (failure !== undefined) {
          // The temporary object (if any) is already gone; a stored result must be undone too.
          if (result) await this.undo(result).catch(() => undefined);
          reject(toHttp(failure));
        } else resolve({ figureId: result!.figureId, assetId: result!.assetId });
      };
      let settled = false;
      bb.on('close', () => {
        if (!settled) {
          settled = true;
          void settle();
        }
      });
      req.pipe(bb);
    });
  }

  private async storeCube(user: Caller, fields: Record<string, string>, sidecarP: Promise<Sidecar> | undefined, stream: Readable & { truncated?: boolean }): Promise<UploadResponse & { key: string }> {
    let check: CubeCheck | undefined;
    const tempKey = uploadTempKey(randomUUID());
    let tempWritten = false;
    try {
      const meta = this.readFields(fields);
      await this.membership.requireAccess(user, meta.publicationId);
      let sidecar: Sidecar | undefined;
      if (meta.format === 'raw') {
        if (!sidecarP) throw new BadRequestException('sidecar: required for format raw (a JSON file part before the cube)');
        sidecar = await sidecarP;
      }
      check = new CubeCheck(meta.format, sidecar);
      const c = check;
      const tooLarge = () => new UploadRejected(413, `cube: larger than the upload limit of ${this.config.uploads.maxBytes} bytes (UPLOAD_MAX_BYTES)`);
      stream.on('limit', () => c.destroy(tooLarge()));
      stream.on('error', (err) => c.destroy(err));
      c.on('error', () => {
        stream.unpipe(c);
        stream.resume(); // drain the rest of the request so the client gets our answer
      });
      stream.pipe(c);
      tempWritten = true;
      try {
        await this.storage.putStream(tempKey, c, 'application/octet-stream');
        if (c.errored) throw c.errored;
      } catch (err) {
        // busboy cuts the file at the limit and may end it before 'limit' is seen: the cut is the reason.
        throw stream.truncated ? tooLarge() : err;
      }
      if (stream.truncated) throw tooLarge();
      const cube = c.result();
      const quantity = sidecar?.quantity ?? meta.quantity ?? 'psi';
      return await this.persist(user, meta, cube, quantity, tempKey);
    } catch (err) {
      stream.resume();
      throw err;
    } finally {
      if (tempWritten) await this.storage.delete(tempKey).catch(() => undefined);
    }
  }

  private readFields(f: Record<string, string>): { publicationId: string; title: string; format: UploadFormat; quantity?: 'psi' | 'density'; fraction: number } {
    const problems: string[] = [];
    if (!UUID.test(f.publicationId ?? '')) problems.push('publicationId must be a UUID (a field part before the cube)');
    const title = (f.title ?? '').trim();
    if (!title) problems.push('title must not be empty');
    else if (title.length > FIGURE_TITLE_MAX) problems.push(`title must be at most ${FIGURE_TITLE_MAX} characters`);
    if (!(UPLOAD_FORMATS as readonly string[]).includes(f.format ?? '')) problems.push(`format must be one of: ${UPLOAD_FORMATS.join(', ')}`);
    if (f.quantity !== undefined && f.quantity !== 'psi' && f.quantity !== 'density') problems.push('quantity must be psi or density');
    const fraction = f.fraction === undefined ? 0.9 : Number(f.fraction);
    if (!(fraction > 0 && fraction < 1)) problems.push('fraction must be between 0 and 1 (exclusive)');
    if (problems.length) throw new BadRequestException(problems);
    return { publicationId: f.publicationId, title, format: f.format as UploadFormat, quantity: f.quantity as 'psi' | 'density' | undefined, fraction };
  }

  private async persist(
    user: Caller,
    meta: { publicationId: string; title: string; format: UploadFormat; fraction: number },
    cube: CubeCheckResult,
    quantity: 'psi' | 'density',
    tempKey: string,
  ): Promise<UploadResponse & { key: string }> {
    const key = uploadKey(cube.sha256);
    await this.storage.copy(tempKey, key, { sha256: cube.sha256 });
    const assetId = randomUUID();
    try {
      const recipe = validateRecipe(uploadRecipe(meta.title, meta.fraction, { ...cube, quantity, assetId }));
      // Version 1 through the figures feature's one writer (house palette included), the asset row in its transaction.
      const { figure } = await this.figures.saveFirst(
        user,
        { publicationId: meta.publicationId, title: meta.title },
        recipe,
        {
          id: assetId,
          publicationId: meta.publicationId,
          kind: 'nrrd',
          storageKey: key,
          bytes: cube.bytes,
          sha256: cube.sha256,
          stats: { sizes: cube.sizes, spacing: cube.spacing, origin: cube.origin, quantity, uploadedAs: meta.format },
        },
      );
      return { figureId: figure.id, assetId, key };
    } catch (err) {
      await this.undo({ figureId: '', assetId: '', key }).catch(() => undefined);
      throw err;
    }
  }

  /** Removes a stored cube unless some asset row refers to it (keys are shared by equal content). */
  private async undo(r: { key?: string } & Partial<UploadResponse>): Promise<void> {
    const key = (r as { key?: string }).key;
    if (key && !(await this.assets.keyReferenced(key))) await this.storage.delete(key);
  }
}

/** The recipe of an uploaded cube: the field comes from the asset; content/grid are placeholders the engine ignores. */
export function uploadRecipe(title: string, fraction: number, c: CubeGeometry & { sha256: string; quantity: 'psi' | 'density'; assetId: string }): unknown {
  const reach = Math.max(...c.sizes.map((n, i) => Math.max(Math.abs(c.origin[i]), Math.abs(c.origin[i] + (n - 1) * c.spacing[i]))));
  const extent = reach > 0 && reach <= RECIPE_LIMITS.extentMax ? reach : 'auto';
  const recipe: Partial<Recipe> & Record<string, unknown> = {
    version: RECIPE_VERSION,
    label: title.slice(0, 80),
    content: { Z: 1, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 1, im: 0 }] },
    grid: { n: Math.min(RECIPE_LIMITS.gridMax, Math.max(RECIPE_LIMITS.gridMin, ...c.sizes)), extent },
    surface: { rule: 'enclosed', fraction },
    source: { kind: 'upload', assetId: c.assetId, sha256: c.sha256, sizes: c.sizes, spacing: c.spacing, origin: c.origin, quantity: c.quantity },
  };
  return recipe;
}

function readSmall(stream: Readable, max: number): Promise<string> {
  return new Promise((resolve, reject) => {
    const parts: Buffer[] = [];
    let n = 0;
    stream.on('data', (b: Buffer) => {
      n += b.length;
      if (n <= max) parts.push(b);
    });
    stream.on('end', () => (n > max ? reject(new BadRequestException(`sidecar: larger than ${max} bytes`)) : resolve(Buffer.concat(parts).toString('utf8'))));
    stream.on('error', reject);
  });
}
