/**
 * Argument checks shared by the measurement computations. A NaN or an infinity that slipped through from
 * a bad reading must stop the computation with a message a person can act on, not turn into a verdict.
 */

/** Throws a RangeError naming the argument unless `x` is a finite number. */
export function requireFinite(name: string, x: number): void {
  if (typeof x !== 'number' || !Number.isFinite(x)) {
    throw new RangeError(`${name} must be a finite number, got ${String(x)}`);
  }
}

/** Throws a RangeError unless `x` is finite and strictly greater than zero. */
export function requirePositive(name: string, x: number): void {
  requireFinite(name, x);
  if (x <= 0) throw new RangeError(`${name} must be greater than 0, got ${x}`);
}

/** Throws a RangeError unless `xs` is an array of at least `min` finite numbers. */
export function requireFiniteArray(name: string, xs: readonly number[], min = 1): void {
  if (!Array.isArray(xs)) throw new RangeError(`${name} must be an array of numbers`);
  if (xs.length < min) throw new RangeError(`${name} needs at least ${min} value(s), got ${xs.length}`);
  for (let i = 0; i < xs.length; i++) {
    if (typeof xs[i] !== 'number' || !Number.isFinite(xs[i])) {
      throw new RangeError(`${name}[${i}] must be a finite number, got ${String(xs[i])}`);
    }
  }
}
