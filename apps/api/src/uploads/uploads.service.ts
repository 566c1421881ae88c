import { randomUUID } from 'node:crypto';
import type { IncomingMessage } from 'node:http';
import type { Readable } from 'node:stream';
import { BadRequestException, HttpException, Inject, Injectable, PayloadTooLargeException } from '@nestjs/common';
import busboy from 'busboy';
import { fractionProblem, RECIPE_LIMITS, RECIPE_VERSION, titleProblem, UPLOAD_FORMATS, type Recipe, type UploadFormat, type UploadResponse, type UserDto } from '@psiform/contracts';
import { APP_CONFIG, type AppConfig, ObjectStorage, AssetStore, FiguresStore, uploadKey, uploadTempKey, CubeCheck, parseSidecar, UploadRejected, type CubeCheckResult, type CubeGeometry } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';
import { FiguresService } from '../figures/figures.service';
import { validateRecipe } from '../figures/recipe-input';
import { inputProblems } from '../common/input/input-rules';
import { dependencyError } from '../common/http-error.filter';

type Caller = Pick<UserDto, 'id' | 'role'>;
type Sidecar = ReturnType<typeof parseSidecar>;
type UploadMeta = { publicationId: string; title: string; format: UploadFormat; quantity?: 'psi' | 'density'; fraction: number };
/** A cube that streamed through CubeCheck into a temporary object; no rows yet. */
interface ReceivedCube {
  meta: UploadMeta;
  cube: CubeCheckResult;
  quantity: 'psi' | 'density';
  tempKey: string;
}

const SIDECAR_MAX_BYTES = 65536;
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function toHttp(err: unknown): HttpException {
  if (err instanceof HttpException) return err;
  const unavailable = dependencyError(err); // storage or database not answering: 503, not the client's fault
  if (unavailable) return unavailable;
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

  /**
   * Parses the whole multipart request before anything is stored: the cube streams (checked) into a temporary
   * object, and only when busboy has seen the closing boundary with no bad or duplicate part are the rows written.
   * Every stream here (request, busboy, each file part) gets its error listener synchronously when it appears:
   * an 'error' with no listener would end the process (a request cut off inside the cube part did).
   */
  receive(user: Caller, req: IncomingMessage): Promise<UploadResponse> {
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
      const seen = new Set<string>();
      let sidecar: Promise<Sidecar> | undefined;
      let work: Promise<ReceivedCube> | undefined;
      let failure: unknown;
      const fail = (err: unknown) => (failure ??= err);
      const duplicate = (name: string) => seen.has(name) || (seen.add(name), false);

      bb.on('field', (name, value, info) => {
        if (duplicate(name)) return fail(new BadRequestException(`${name}: part given twice`));
        if (work) return fail(new BadRequestException(`${name}: must come before the cube part`));
        if (info.valueTruncated) return fail(new BadRequestException(`${name}: value too long`));
        fields[name] = value;
      });
      bb.on('file', (name, stream) => {
        stream.on('error', (err: Error) => fail(new BadRequestException(`${name}: ${err.message}`)));
        if (duplicate(name)) {
          stream.resume();
          return fail(new BadRequestException(`${name}: part given twice`));
        }
        if (name === 'sidecar' && !work) {
          sidecar = readSmall(stream, SIDECAR_MAX_BYTES).then(parseSidecar);
          sidecar.catch(fail);
        } else if (name === 'cube' && failure === undefined) {
          work = this.receiveCube(user, fields, sidecar, stream);
          work.catch(fail);
        } else {
          stream.resume();
          fail(new BadRequestException(name === 'cube' || name === 'sidecar' ? `${name}: part out of order` : `unexpected file part "${name}" (expected sidecar, cube)`));
        }
      });
      bb.on('partsLimit', () => fail(new BadRequestException('too many parts in the upload')));
      bb.on('filesLimit', () => fail(new BadRequestException('too many files in the upload (expected sidecar, cube)')));
      bb.on('fieldsLimit', () => fail(new BadRequestException('too many fields in the upload')));
      let settled = false;
      const settle = async () => {
        if (settled) return;
        settled = true;
        const received = work ? await work.catch((e) => (fail(e), undefined)) : undefined;
        if (!work && failure === undefined) fail(new BadRequestException('cube: the file part is missing'));
        let outcome: { ok: UploadResponse } | { err: unknown };
        try {
          if (failure !== undefined) throw failure;
          outcome = { ok: await this.persist(user, received!) };
        } catch (err) {
          outcome = { err };
        }
        // The temporary object goes before the answer, so a client that sees the answer sees no leftovers.
        if (received) await this.storage.delete(received.tempKey).catch(() => undefined);
        if ('ok' in outcome) resolve(outcome.ok);
        else reject(toHttp(outcome.err));
      };
      bb.on('error', (err: Error) => {
        fail(new BadRequestException(`malformed multipart request: ${err.message}`));
        req.unpipe(bb);
        req.resume(); // drain the rest so the client gets our answer
        void settle();
      });
      bb.on('close', () => void settle());
      // A client that goes away mid-request: end busboy with an error (it destroys the open file part with it).
      const abort = () => bb.destroy(new Error('the request was cut off'));
      req.on('aborted', abort);
      req.on('error', abort);
      req.pipe(bb);
    });
  }

  /** Streams the cube through CubeCheck into a temporary object; stores no rows. */
  private async receiveCube(user: Caller, fields: Record<string, string>, sidecarP: Promise<Sidecar> | undefined, stream: Readable & { truncated?: boolean }): Promise<ReceivedCube> {
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
      // The part may have failed while we awaited (a request cut off inside it): its error listener ran already.
      if (stream.errored || stream.destroyed) throw new BadRequestException(`cube: ${stream.errored?.message ?? 'the part ended early'}`);
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
      return { meta, cube: c.result(), quantity: sidecar?.quantity ?? meta.quantity ?? 'psi', tempKey };
    } catch (err) {
      stream.resume();
      if (tempWritten) await this.storage.delete(tempKey).catch(() => undefined);
      throw err;
    }
  }

  private readFields(f: Record<string, string>): UploadMeta {
    const problems: string[] = inputProblems(f, 'fields'); // the rules every JSON body meets (NUL, lone surrogates…)
    if (problems.length) throw new BadRequestException(problems);
    if (!UUID.test(f.publicationId ?? '')) problems.push('publicationId must be a UUID (a field part before the cube)');
    const title = (f.title ?? '').trim();
    const tp = titleProblem(title);
    if (tp) problems.push(`title ${tp}`);
    if (!(UPLOAD_FORMATS as readonly string[]).includes(f.format ?? '')) problems.push(`format must be one of: ${UPLOAD_FORMATS.join(', ')}`);
    if (f.quantity !== undefined && f.quantity !== 'psi' && f.quantity !== 'density') problems.push('quantity must be psi or density');
    const fraction = f.fraction === undefined ? 0.9 : Number(f.fraction);
    const fp = fractionProblem(fraction);
    if (fp) problems.push(`fraction ${fp}`);
    if (problems.length) throw new BadRequestException(problems);
    return { publicationId: f.publicationId, title, format: f.format as UploadFormat, quantity: f.quantity as 'psi' | 'density' | undefined, fraction };
  }

  /** Copies the checked cube to its content-derived key, then writes figure, version and asset in one transaction. */
  private async persist(user: Caller, { meta, cube, quantity, tempKey }: ReceivedCube): Promise<UploadResponse> {
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
      return { figureId: figure.id, assetId };
    } catch (err) {
      await this.undo(key).catch(() => undefined);
      throw err;
    }
  }

  /** Removes a stored cube unless some asset row refers to it (keys are shared by equal content). */
  private async undo(key: string): Promise<void> {
    if (!(await this.assets.keyReferenced(key))) await this.storage.delete(key);
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
