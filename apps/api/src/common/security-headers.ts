import type { NextFunction, Request, RequestHandler, Response } from 'express';
import helmet from 'helmet';

/**
 * Content-Security-Policy directives for the client and the headless render page (both built from apps/web and
 * served from the same origin). Scripts only from our own files (Vite emits no inline script); styles also inline
 * (render.html carries a small <style>, Blueprint positions popovers with style attributes); meshes, thumbnails and
 * proofs come from presigned storage URLs, so the storage origin may be fetched and shown; the preview runs in a
 * module Web Worker from our own origin; file downloads are built as blob: URLs. No plug-ins, no framing.
 */
export function contentSecurityDirectives(storageOrigins: string[]): Record<string, string[]> {
  const storage = [...new Set(storageOrigins)];
  return {
    'default-src': ["'self'"],
    'script-src': ["'self'"],
    'style-src': ["'self'", "'unsafe-inline'"],
    'img-src': ["'self'", 'data:', 'blob:', ...storage],
    'font-src': ["'self'", 'data:'],
    'connect-src': ["'self'", 'blob:', ...storage],
    'worker-src': ["'self'", 'blob:'],
    'object-src': ["'none'"],
    'base-uri': ["'self'"],
    'form-action': ["'self'"],
    'frame-ancestors': ["'none'"],
  };
}

/** The CSP header value (the worker's render site sends the same one). */
export function contentSecurityPolicy(storageOrigins: string[]): string {
  return Object.entries(contentSecurityDirectives(storageOrigins))
    .map(([k, v]) => `${k} ${v.join(' ')}`)
    .join('; ');
}

/**
 * helmet 8 with our CSP: nosniff, X-Frame-Options DENY (and frame-ancestors 'none'), Referrer-Policy no-referrer,
 * no X-Powered-By, HSTS left to the TLS-terminating proxy (the app itself speaks plain HTTP on loopback).
 */
export function securityHeaders(storageOrigins: string[]): RequestHandler {
  return helmet({
    contentSecurityPolicy: { useDefaults: false, directives: contentSecurityDirectives(storageOrigins) },
    frameguard: { action: 'deny' },
    referrerPolicy: { policy: 'no-referrer' },
    strictTransportSecurity: false,
    crossOriginEmbedderPolicy: false,
    crossOriginResourcePolicy: { policy: 'same-origin' },
  });
}

/** API answers (signed-in JSON above all) must not be kept by browsers or shared caches. */
export function noStoreForApi(prefix: string): RequestHandler {
  return (req: Request, res: Response, next: NextFunction) => {
    if (req.path === `/${prefix}` || req.path.startsWith(`/${prefix}/`)) {
      res.setHeader('Cache-Control', 'no-store');
      res.setHeader('Pragma', 'no-cache');
    }
    next();
  };
}
