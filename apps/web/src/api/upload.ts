import { ApiError, isErrorBody, serverMessage, type ApiClient } from './client';

export type CubeFormat = 'nrrd' | 'raw';

export interface UploadCubeRequest {
  publicationId: string;
  title: string;
  format: CubeFormat;
  cube: File;
  /** Required for raw: the JSON sidecar file. */
  sidecar?: File | null;
  /** NRRD only (raw takes it from the sidecar): the cube holds ψ (signed) or the density |ψ|². */
  quantity?: 'psi' | 'density';
  /** Enclosed-probability fraction of the surface (server default 0.9). */
  fraction?: number;
}

export interface UploadCubeResponse {
  figureId: string;
  assetId: string;
}

export interface UploadProgress {
  loaded: number;
  total: number;
  /** 0..1, or null while the total is unknown. */
  fraction: number | null;
}

/** The multipart body in the order the server reads it: publicationId, title, format, [quantity], [fraction], [sidecar], cube. */
export function uploadFormData(req: UploadCubeRequest): FormData {
  const form = new FormData();
  form.append('publicationId', req.publicationId);
  form.append('title', req.title);
  form.append('format', req.format);
  if (req.format === 'nrrd' && req.quantity) form.append('quantity', req.quantity);
  if (req.fraction !== undefined) form.append('fraction', String(req.fraction));
  if (req.format === 'raw') {
    if (!req.sidecar) throw new Error('A raw cube needs its JSON sidecar.');
    form.append('sidecar', req.sidecar, req.sidecar.name);
  }
  form.append('cube', req.cube, req.cube.name);
  return form;
}

/**
 * `POST /api/uploads` through XMLHttpRequest, because fetch reports no upload progress.
 * Rejects with an ApiError carrying the server's message (400, 413, ...) or kind 'network'.
 */
export function uploadCube(
  api: ApiClient,
  req: UploadCubeRequest,
  opts: { onProgress?: (p: UploadProgress) => void; signal?: AbortSignal } = {},
): Promise<UploadCubeResponse> {
  const form = uploadFormData(req);
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', api.url('/api/uploads'));
    xhr.setRequestHeader('Accept', 'application/json');
    const token = api.token();
    if (token) xhr.setRequestHeader('Authorization', `Bearer ${token}`);
    xhr.upload.onprogress = (e) => {
      opts.onProgress?.({ loaded: e.loaded, total: e.total, fraction: e.lengthComputable && e.total > 0 ? e.loaded / e.total : null });
    };
    xhr.onerror = () => reject(new ApiError('network', 0, 'The upload could not reach the Psiform server.'));
    xhr.onabort = () => reject(new DOMException('Upload cancelled', 'AbortError'));
    xhr.onload = () => {
      let data: unknown;
      try {
        data = xhr.responseText ? JSON.parse(xhr.responseText) : null;
      } catch {
        data = undefined;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        const ok = data as Partial<UploadCubeResponse> | null | undefined;
        if (ok && typeof ok.figureId === 'string') {
          resolve({ figureId: ok.figureId, assetId: String(ok.assetId ?? '') });
        } else {
          reject(new ApiError('invalid-response', xhr.status, "The server's answer to the upload did not name the new figure."));
        }
        return;
      }
      const body = isErrorBody(data) ? data : null;
      if (xhr.status === 401) api.unauthorized();
      const fallback =
        xhr.status === 413 ? 'The file is larger than the server accepts.' : `The upload was refused (HTTP ${xhr.status}).`;
      reject(new ApiError('http', xhr.status, serverMessage(body) ?? fallback, body));
    };
    opts.signal?.addEventListener('abort', () => xhr.abort());
    xhr.send(form);
  });
}
