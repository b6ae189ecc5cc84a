import { apiBase } from '@/config/paths';
import { ApiError, tokenStore } from '@/lib/api-client';

/**
 * Fetches a CSV route as a Blob with the signed-in user's token. The shared client reads JSON only, so CSV
 * downloads (measurements, audit trail) go through here and answer errors in the client's shape.
 * `what` names the download in the offline message ("the audit trail"); `fallbackName` is used when the server
 * sends no file name.
 */
export async function downloadCsv(
  path: string,
  params: URLSearchParams,
  what: string,
  fallbackName: string,
): Promise<{ blob: Blob; fileName: string }> {
  const token = tokenStore.get();
  let res: Response;
  try {
    res = await fetch(`${apiBase}${path}?${params.toString()}`, {
      headers: { Accept: 'text/csv', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  } catch {
    throw new ApiError(0, 'Network Error', `The station server cannot be reached, so ${what} could not be exported.`);
  }
  if (!res.ok) {
    let message = `The export could not be made (HTTP ${res.status}).`;
    try {
      const body = (await res.json()) as { message?: unknown };
      if (typeof body.message === 'string' && body.message) message = body.message;
    } catch {
      // not JSON: keep the plain message
    }
    throw new ApiError(res.status, res.statusText || 'Error', message);
  }
  const fileName = /filename="([^"]+)"/.exec(res.headers.get('Content-Disposition') ?? '')?.[1] ?? fallbackName;
  return { blob: await res.blob(), fileName };
}
