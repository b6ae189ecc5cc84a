import { apiBase, paths } from '@/config/paths';

/** One field that failed validation, as the server lists it. */
export interface FieldProblem {
  field: string;
  problems: string[];
}

/**
 * An error answered by the station server (or the failure to reach it). `message` is meant for people
 * and is shown as it is; `code` carries `details.code` for domain refusals.
 */
export class ApiError extends Error {
  readonly status: number;
  readonly error: string;
  readonly details: unknown;

  constructor(status: number, error: string, message: string, details?: unknown) {
    super(message);
    this.name = 'ApiError';
    this.status = status;
    this.error = error;
    this.details = details;
  }

  /** Machine-readable refusal code (`details.code`), when the server sent one. */
  get code(): string | undefined {
    const d = this.details as { code?: unknown } | undefined;
    return d && typeof d === 'object' && !Array.isArray(d) && typeof d.code === 'string' ? d.code : undefined;
  }

  /** Validation problems per field (`details: [{field, problems}]`), empty when there are none. */
  get fieldProblems(): FieldProblem[] {
    if (!Array.isArray(this.details)) return [];
    return this.details.filter(
      (d): d is FieldProblem =>
        typeof d === 'object' && d !== null && typeof d.field === 'string' && Array.isArray(d.problems),
    );
  }
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError;
}

const TOKEN_KEY = 'railwright.token';

/** The bearer token lives in localStorage so a reload keeps the shift signed in. */
export const tokenStore = {
  get(): string | null {
    try {
      return window.localStorage.getItem(TOKEN_KEY);
    } catch {
      return null;
    }
  },
  set(token: string): void {
    window.localStorage.setItem(TOKEN_KEY, token);
  },
  clear(): void {
    try {
      window.localStorage.removeItem(TOKEN_KEY);
    } catch {
      // storage blocked (private mode): nothing stored, nothing to clear
    }
  },
};

type UnauthorizedHandler = (error: ApiError) => void;

let onUnauthorized: UnauthorizedHandler = () => {
  // Until the router registers a gentler handler: a full reload to the sign-in page.
  window.location.assign(paths.signIn.href(window.location.pathname + window.location.search));
};

/** The app's router installs this so a 401 anywhere sends people to sign in and back again. */
export function setUnauthorizedHandler(handler: UnauthorizedHandler): void {
  onUnauthorized = handler;
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PATCH' | 'PUT' | 'DELETE';
  body?: unknown;
  query?: Record<string, string | number | boolean | null | undefined>;
  signal?: AbortSignal;
  /**
   * The sign-in request itself answers 401 for a wrong password; that must be shown on the form,
   * not treated as an expired session.
   */
  skipUnauthorizedRedirect?: boolean;
  /** A token other than the signed-in person's (the wall board's display token); sent instead of it. */
  token?: string;
}

function buildUrl(path: string, query?: RequestOptions['query']): string {
  const url = `${apiBase}${path}`;
  if (!query) return url;
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) {
    if (v === undefined || v === null || v === '') continue;
    params.set(k, String(v));
  }
  const qs = params.toString();
  return qs ? `${url}?${qs}` : url;
}

/** Turns a non-2xx response into an ApiError, whatever the body looks like. */
async function toApiError(res: Response): Promise<ApiError> {
  const text = await res.text().catch(() => '');
  let body: unknown;
  try {
    body = text ? JSON.parse(text) : undefined;
  } catch {
    body = undefined;
  }
  if (body && typeof body === 'object') {
    const b = body as { statusCode?: unknown; error?: unknown; message?: unknown; details?: unknown };
    const message = Array.isArray(b.message) ? b.message.join('; ') : typeof b.message === 'string' ? b.message : '';
    if (message) {
      return new ApiError(res.status, typeof b.error === 'string' ? b.error : res.statusText, message, b.details);
    }
  }
  // A proxy page or an empty body: say what happened in words a person can act on.
  const fallback =
    res.status >= 500
      ? `The station server had a problem (HTTP ${res.status}). Try again; if it keeps happening, tell your supervisor.`
      : `The station server refused the request (HTTP ${res.status}).`;
  return new ApiError(res.status, res.statusText || 'Error', fallback);
}

/**
 * Calls the station API: adds the bearer token, sends and parses JSON, and throws an {@link ApiError}
 * for every failure (including "server not reachable", status 0). A 401 clears the token and sends
 * people to sign in, remembering where they were.
 */
export async function apiRequest<T>(path: string, options: RequestOptions = {}): Promise<T> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const token = options.token ?? tokenStore.get();
  if (token) headers.Authorization = `Bearer ${token}`;
  if (options.body !== undefined) headers['Content-Type'] = 'application/json';

  let res: Response;
  try {
    res = await fetch(buildUrl(path, options.query), {
      method: options.method ?? 'GET',
      headers,
      body: options.body !== undefined ? JSON.stringify(options.body) : undefined,
      signal: options.signal,
    });
  } catch (e) {
    if (e instanceof DOMException && e.name === 'AbortError') throw e;
    throw new ApiError(
      0,
      'Network Error',
      'The station server cannot be reached. Check the network connection and try again.',
    );
  }

  if (!res.ok) {
    const err = await toApiError(res);
    if (res.status === 401 && !options.skipUnauthorizedRedirect) {
      tokenStore.clear();
      onUnauthorized(err);
    }
    throw err;
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  if (!text) return undefined as T;
  try {
    return JSON.parse(text) as T;
  } catch {
    throw new ApiError(res.status, 'Bad Response', 'The station server sent an answer this screen cannot read.');
  }
}

export const api = {
  get: <T>(path: string, opts?: Omit<RequestOptions, 'method' | 'body'>) => apiRequest<T>(path, { ...opts, method: 'GET' }),
  post: <T>(path: string, body?: unknown, opts?: Omit<RequestOptions, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...opts, method: 'POST', body }),
  patch: <T>(path: string, body?: unknown, opts?: Omit<RequestOptions, 'method' | 'body'>) =>
    apiRequest<T>(path, { ...opts, method: 'PATCH', body }),
};
