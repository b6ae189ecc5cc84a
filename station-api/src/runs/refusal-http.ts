import { HttpException } from '@nestjs/common';
import { RunRefusal } from './run-refusal';

/** Turns an engine refusal into the API error shape with `details.code` (and any extra details). */
export function toHttp(err: unknown): unknown {
  if (err instanceof RunRefusal) {
    return new HttpException({ message: err.message, details: { code: err.code, ...err.extra } }, err.httpStatus);
  }
  return err;
}

/** Awaits a service call and maps its refusal. */
export async function refusing<T>(work: Promise<T>): Promise<T> {
  try {
    return await work;
  } catch (err) {
    throw toHttp(err);
  }
}
