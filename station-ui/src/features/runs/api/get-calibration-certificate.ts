import { apiBase, apiPaths } from '@/config/paths';
import { ApiError, tokenStore } from '@/lib/api-client';

/**
 * `GET /api/fixtures/:id/calibrations/:calibrationId/certificate` as a Blob: the certificate of the calibration a
 * run was judged with. The shared API client reads JSON only, so this fetch is done by hand with the same bearer
 * token and the same error shape.
 */
export async function getCalibrationCertificate(fixtureId: number, calibrationId: number): Promise<Blob> {
  const token = tokenStore.get();
  let res: Response;
  try {
    res = await fetch(`${apiBase}${apiPaths.fixtureCertificate(fixtureId, calibrationId)}`, {
      headers: { Accept: 'application/pdf', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    });
  } catch {
    throw new ApiError(0, 'Network Error', 'The station server cannot be reached, so the certificate could not be fetched.');
  }
  if (!res.ok) {
    let message = `The certificate could not be fetched (HTTP ${res.status}).`;
    try {
      const body = (await res.json()) as { message?: unknown };
      if (typeof body.message === 'string' && body.message) message = body.message;
    } catch {
      // not JSON: keep the plain message
    }
    throw new ApiError(res.status, res.statusText || 'Error', message);
  }
  const blob = await res.blob();
  return blob.type === 'application/pdf' ? blob : new Blob([blob], { type: 'application/pdf' });
}
