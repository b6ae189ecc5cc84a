import type { NextFunction, Request, Response } from 'express';
import { json } from 'express';
import { STATUS_CODES } from 'node:http';
import type { ApiError } from '../filters/http-exception.filter';
import { hasControlCharacter, inspectBody } from './body-inspection';

/** Largest JSON body accepted (body-parser's default). A plan file, the largest body, is a few kB. */
export const JSON_BODY_LIMIT = '100kb';

function send(res: Response, statusCode: number, message: string, details?: unknown): void {
  const body: ApiError = { statusCode, error: STATUS_CODES[statusCode] ?? 'Error', message, ...(details !== undefined ? { details } : {}) };
  res.status(statusCode).json(body);
}

function isApi(req: Request): boolean {
  return req.path === '/api' || req.path.startsWith('/api/');
}

function hasBody(req: Request): boolean {
  const length = req.headers['content-length'];
  return req.headers['transfer-encoding'] !== undefined || (length !== undefined && length !== '0');
}

/**
 * Refuses paths and query strings that carry control characters once decoded (`%00` in a serial reached
 * SQLite and answered 500) or that cannot be decoded at all.
 */
export function refuseControlCharactersInUrl(req: Request, res: Response, next: NextFunction): void {
  if (!isApi(req)) return next();
  let decoded: string;
  try {
    decoded = decodeURIComponent(req.originalUrl);
  } catch {
    return send(res, 400, 'The address contains a malformed %-escape; check the link or the scanned text.', { code: 'bad_url' });
  }
  if (hasControlCharacter(decoded)) {
    return send(res, 400, 'The address contains a control character (e.g. %00); a serial or id never does. Scan or type it again.', { code: 'bad_url' });
  }
  next();
}

/** The routes that take a file upload (multipart/form-data) instead of JSON: method and path as sent. */
const MULTIPART_ROUTES = new Set([
  'POST /api/plans/import',
  // lots (issue 12, H4): a CSV lot file
  'POST /api/lots/import',
  // H1: characterization data (CSV upload)
  'POST /api/characterization/data-sets',
]);
/** Upload routes with an id in the path (checked as patterns: `METHOD /api/path`) */
const MULTIPART_ROUTE_PATTERNS: readonly RegExp[] = [
  // fixtures and calibration (issue 10, H2): a calibration record with its certificate PDF
  /^POST \/api\/fixtures\/\d+\/calibrations$/,
];

function isMultipartRoute(method: string, path: string): boolean {
  const key = `${method} ${path}`;
  return MULTIPART_ROUTES.has(key) || MULTIPART_ROUTE_PATTERNS.some((p) => p.test(key));
}

/**
 * Bodies sent to the API must be JSON. A text/plain or XML PATCH used to answer 200 and change nothing;
 * form-encoded bodies were accepted. Now each is refused with 415 before a route sees it.
 */
export function requireJsonBodies(req: Request, res: Response, next: NextFunction): void {
  if (!isApi(req) || !hasBody(req)) return next();
  const type = (req.headers['content-type'] ?? '').toLowerCase();
  // the file uploads (a plan file) take multipart/form-data, and only those routes
  if (isMultipartRoute(req.method, req.path) && /^multipart\/form-data\s*;/.test(type)) return next();
  if (!/^application\/json\s*(;|$)/.test(type)) {
    return send(res, 415, `The API accepts only JSON bodies: send "Content-Type: application/json" (this request sent ${type ? `"${type}"` : 'no content type'}).`, { code: 'unsupported_media_type' });
  }
  next();
}

const parseJson = json({ limit: JSON_BODY_LIMIT, strict: true, type: 'application/json' });

/**
 * Parses JSON bodies and answers the parser's own failures here, in the API's error shape, so whatever
 * comes later (the static UI included) never turns them into "Cannot POST" 404s.
 */
export function parseJsonBodies(req: Request, res: Response, next: NextFunction): void {
  if (!isApi(req)) return next();
  parseJson(req, res, (err?: unknown) => {
    if (!err) return next();
    const e = err as { status?: number; type?: string; limit?: number; message?: string };
    if (e.type === 'entity.too.large') {
      return send(res, 413, `The request body is larger than the ${JSON_BODY_LIMIT} accepted. Send less, or split it up.`, { code: 'body_too_large' });
    }
    if (e.type === 'entity.parse.failed') {
      return send(res, 400, `The request body is not valid JSON: ${String(e.message ?? '').slice(0, 200)}`, { code: 'invalid_json' });
    }
    if (e.type === 'charset.unsupported' || e.type === 'encoding.unsupported') {
      return send(res, 415, 'The request body must be UTF-8 encoded JSON.', { code: 'unsupported_media_type' });
    }
    const status = typeof e.status === 'number' && e.status >= 400 && e.status < 500 ? e.status : 400;
    send(res, status, `The request body could not be read: ${String(e.message ?? 'unknown reason').slice(0, 200)}`, { code: 'unreadable_body' });
  });
}

/** Depth, prototype keys and control characters, with the field named (see body-inspection.ts). */
export function inspectJsonBodies(req: Request, res: Response, next: NextFunction): void {
  if (!isApi(req) || req.body === undefined) return next();
  const problem = inspectBody(req.body);
  if (problem) return send(res, 400, problem.message, { code: 'bad_body', field: problem.field });
  next();
}
