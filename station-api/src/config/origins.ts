/** CORS_ORIGINS as a list (empty: same origin only). */
export function allowedOrigins(setting: string): string[] {
  return setting
    .split(',')
    .map((o) => o.trim().replace(/\/+$/, ''))
    .filter(Boolean);
}

/**
 * Whether a browser origin may open a socket or call the API: no Origin header (not a browser, e.g. a
 * script or the station's own tests), the server's own host, or one of the configured origins.
 */
export function originAllowed(origin: string | undefined, host: string | undefined, allowed: readonly string[]): boolean {
  if (!origin) return true;
  if (allowed.includes(origin.replace(/\/+$/, ''))) return true;
  try {
    return host !== undefined && new URL(origin).host === host;
  } catch {
    return false;
  }
}
