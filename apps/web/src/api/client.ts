import type {
  ApiErrorBody,
  CreateFigureRequest,
  FigureDto,
  FigureSortKey,
  FigureStatus,
  FigureSummaryDto,
  HealthResponse,
  JobDto,
  LoginRequest,
  LoginResponse,
  Page,
  PublicationDto,
  UpdateFigureRequest,
  UserDto,
} from '@psiform/contracts';

/** Why a call failed: the server answered with an error status, or it could not be reached / read. */
export type ApiErrorKind = 'http' | 'network' | 'invalid-response';

export class ApiError extends Error {
  readonly kind: ApiErrorKind;
  /** HTTP status; 0 when there was no answer. */
  readonly status: number;
  readonly body: ApiErrorBody | null;
  /** Seconds from a Retry-After header, when the server sent one (429). */
  readonly retryAfterSeconds: number | null;

  constructor(
    kind: ApiErrorKind,
    status: number,
    message: string,
    body: ApiErrorBody | null = null,
    retryAfterSeconds: number | null = null,
  ) {
    super(message);
    this.name = 'ApiError';
    this.kind = kind;
    this.status = status;
    this.body = body;
    this.retryAfterSeconds = retryAfterSeconds;
  }
}

export function isErrorBody(value: unknown): value is ApiErrorBody {
  if (typeof value !== 'object' || value === null) return false;
  const m = (value as { message?: unknown }).message;
  return typeof m === 'string' || (Array.isArray(m) && m.every((x) => typeof x === 'string'));
}

/** The server's own words from an error body (NestJS sends a string or a list of validation messages). */
export function serverMessage(body: ApiErrorBody | null): string | null {
  if (!body) return null;
  const text = Array.isArray(body.message) ? body.message.join('; ') : body.message;
  return text.trim() ? text : null;
}

function sentence(text: string): string {
  return /[.!?]$/.test(text) ? text : `${text}.`;
}

/** A sentence a person can act on, for any error thrown by the client (or anything else). */
export function describeError(err: unknown): string {
  if (err instanceof ApiError) {
    if (err.kind === 'network') {
      return 'Could not reach the Psiform server. Check your connection and try again.';
    }
    const said = serverMessage(err.body);
    if (err.status === 429) {
      const base = said ? sentence(said) : 'Too many attempts in a short time. Wait a minute, then try again.';
      const wait = err.retryAfterSeconds ? ` Try again in ${err.retryAfterSeconds} seconds.` : '';
      return `${base}${wait}`;
    }
    if (err.status === 401) return said ?? 'Your email or password was not accepted.';
    if (err.status === 403) return said ?? 'Your role does not allow this.';
    if (err.status >= 500) {
      return `The Psiform server could not complete the request (HTTP ${err.status}). Try again shortly.`;
    }
    if (said) return said;
    return err.message;
  }
  if (err instanceof Error) return err.message;
  return 'Something went wrong.';
}

export interface ApiClientOptions {
  /** Prefix before /api/...; empty for the same origin. */
  baseUrl?: string;
  getToken: () => string | null;
  /** Called when a request that carried a token is answered 401 (expired or revoked session). */
  onUnauthorized: () => void;
}

interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  /** Send the Bearer token (default true). Sign-in sends none, so its 401 is "bad credentials", not "session over". */
  auth?: boolean;
  signal?: AbortSignal;
}

async function readJson(res: Response): Promise<unknown> {
  const text = await res.text();
  if (!text) return null;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    return undefined; // not JSON (e.g. an HTML page from a proxy)
  }
}

export interface FigureListParams {
  publicationId: string;
  page: number;
  pageSize: number;
  q?: string;
  status?: FigureStatus | '';
  sort: FigureSortKey;
  order: 'asc' | 'desc';
}

/** `/api/figures?...` with the parameters in a fixed order (empty search and filter left out). */
export function figuresListPath(p: FigureListParams): string {
  const qs = new URLSearchParams();
  qs.set('publicationId', p.publicationId);
  qs.set('page', String(p.page));
  qs.set('pageSize', String(p.pageSize));
  if (p.q && p.q.trim()) qs.set('q', p.q.trim());
  if (p.status) qs.set('status', p.status);
  qs.set('sort', p.sort);
  qs.set('order', p.order);
  return `/api/figures?${qs.toString()}`;
}

export interface AssetLink {
  url: string;
  expiresAt: string;
  /** The name the file downloads under (named from the figure by the server). */
  fileName: string;
}

export interface ApiClient {
  request<T>(path: string, options?: RequestOptions): Promise<T>;
  /** Absolute-or-relative URL of an API path (for streams and uploads that bypass `request`). */
  url(path: string): string;
  /** The current access token (streams and XHR uploads add it themselves). */
  token(): string | null;
  /** Tell the session a call made outside `request` was answered 401. */
  unauthorized(): void;
  listFigures(params: FigureListParams, signal?: AbortSignal): Promise<Page<FigureSummaryDto>>;
  createFigure(body: CreateFigureRequest): Promise<FigureDto>;
  figure(id: string, signal?: AbortSignal): Promise<FigureDto>;
  updateFigure(id: string, body: UpdateFigureRequest): Promise<FigureDto>;
  computeMesh(figureId: string): Promise<{ jobId: string }>;
  job(id: string, signal?: AbortSignal): Promise<JobDto>;
  assetLink(id: string, signal?: AbortSignal): Promise<AssetLink>;
  login(credentials: LoginRequest): Promise<LoginResponse>;
  me(signal?: AbortSignal): Promise<UserDto>;
  publications(signal?: AbortSignal): Promise<PublicationDto[]>;
  health(signal?: AbortSignal): Promise<HealthResponse>;
}

export function createApiClient(options: ApiClientOptions): ApiClient {
  const base = options.baseUrl ?? '';

  async function send(path: string, opts: RequestOptions): Promise<Response> {
    const headers: Record<string, string> = { Accept: 'application/json' };
    if (opts.body !== undefined) headers['Content-Type'] = 'application/json';
    const token = opts.auth === false ? null : options.getToken();
    if (token) headers.Authorization = `Bearer ${token}`;
    try {
      // Looked up per call so tests (and polyfills) can replace the global fetch.
      return await globalThis.fetch(`${base}${path}`, {
        method: opts.method ?? 'GET',
        headers,
        body: opts.body === undefined ? undefined : JSON.stringify(opts.body),
        signal: opts.signal,
      });
    } catch (err) {
      if (err instanceof DOMException && err.name === 'AbortError') throw err;
      throw new ApiError('network', 0, err instanceof Error ? err.message : 'Network request failed');
    }
  }

  async function request<T>(path: string, opts: RequestOptions = {}): Promise<T> {
    const res = await send(path, opts);
    const data = await readJson(res);
    if (!res.ok) {
      const body = isErrorBody(data) ? data : null;
      const retry = Number(res.headers.get('Retry-After'));
      const sentToken = opts.auth !== false && options.getToken() !== null;
      if (res.status === 401 && sentToken) options.onUnauthorized();
      throw new ApiError(
        'http',
        res.status,
        serverMessage(body) ?? `HTTP ${res.status}`,
        body,
        Number.isFinite(retry) && retry > 0 ? retry : null,
      );
    }
    if (data === undefined) {
      throw new ApiError('invalid-response', res.status, `The server's answer to ${path} was not JSON.`);
    }
    return data as T;
  }

  async function health(signal?: AbortSignal): Promise<HealthResponse> {
    // A degraded stack may answer 503 with the same body; the service words are what we show.
    const res = await send('/api/health', { auth: false, signal });
    const data = await readJson(res);
    if (typeof data === 'object' && data !== null && 'services' in data) return data as HealthResponse;
    throw new ApiError(res.ok ? 'invalid-response' : 'http', res.status, `Health check answered HTTP ${res.status}`);
  }

  const enc = encodeURIComponent;
  return {
    request,
    url: (path) => `${base}${path}`,
    token: () => options.getToken(),
    unauthorized: () => {
      if (options.getToken() !== null) options.onUnauthorized();
    },
    listFigures: (params, signal) => request<Page<FigureSummaryDto>>(figuresListPath(params), { signal }),
    createFigure: (body) => request<FigureDto>('/api/figures', { method: 'POST', body }),
    figure: (id, signal) => request<FigureDto>(`/api/figures/${enc(id)}`, { signal }),
    updateFigure: (id, body) => request<FigureDto>(`/api/figures/${enc(id)}`, { method: 'PATCH', body }),
    computeMesh: (figureId) => request<{ jobId: string }>(`/api/figures/${enc(figureId)}/meshes`, { method: 'POST' }),
    job: (id, signal) => request<JobDto>(`/api/jobs/${enc(id)}`, { signal }),
    assetLink: (id, signal) => request<AssetLink>(`/api/assets/${enc(id)}/link`, { signal }),
    login: (credentials) =>
      request<LoginResponse>('/api/auth/login', { method: 'POST', body: credentials, auth: false }),
    me: (signal) => request<UserDto>('/api/auth/me', { signal }),
    publications: (signal) => request<PublicationDto[]>('/api/publications', { signal }),
    health,
  };
}
