/**
 * The chi-square distribution, needed for the exact confidence interval of Cp and Pp.
 *
 * Method:
 * - ln Γ(a) by Stirling's series with six correction terms (Abramowitz & Stegun 6.1.41), after shifting a up
 *   to at least 15 with Γ(a + 1) = a·Γ(a); relative error below 1e-15 there.
 * - the regularised lower incomplete gamma P(a, x) by its power series for x < a + 1 and by the Legendre
 *   continued fraction of Q(a, x) otherwise (A&S 6.5.29 and 6.5.31; Press et al., Numerical Recipes, 3rd ed.,
 *   §6.2, modified Lentz evaluation).
 * - the chi-square distribution function F(x; k) = P(k/2, x/2), and its quantile by safeguarded Newton steps
 *   (bisection whenever a Newton step would leave the bracket).
 * The tests compare with jStat.gammaln, jStat.chisquare.cdf and jStat.chisquare.inv.
 */

const LN_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/**
 * Natural logarithm of the gamma function for a > 0.
 * @throws RangeError for a ≤ 0 or a non-finite a
 */
export function gammaLn(a: number): number {
  if (!(a > 0) || !Number.isFinite(a)) throw new RangeError(`gammaLn needs a positive finite argument, got ${a}`);
  let shift = 0;
  let x = a;
  while (x < 15) {
    shift += Math.log(x);
    x += 1;
  }
  const inv = 1 / x;
  const inv2 = inv * inv;
  // Stirling series B₂ₖ/(2k(2k − 1)x^(2k−1)), k = 1..6: 1/12, −1/360, 1/1260, −1/1680, 1/1188, −691/360360.
  // At x ≥ 15 the first omitted term, 1/(156x¹¹), is below 1e-15 of ln Γ.
  const series =
    inv * (1 / 12 - inv2 * (1 / 360 - inv2 * (1 / 1260 - inv2 * (1 / 1680 - inv2 * (1 / 1188 - (inv2 * 691) / 360360)))));
  return (x - 0.5) * Math.log(x) - x + LN_SQRT_2PI + series - shift;
}

/**
 * Regularised lower incomplete gamma function P(a, x) = γ(a, x)/Γ(a).
 * @param a shape, > 0
 * @param x ≥ 0
 */
export function gammaP(a: number, x: number): number {
  if (!(a > 0)) throw new RangeError(`gammaP needs a > 0, got ${a}`);
  if (!(x >= 0)) throw new RangeError(`gammaP needs x ≥ 0, got ${x}`);
  if (x === 0) return 0;
  if (x === Infinity) return 1;
  const lnFront = a * Math.log(x) - x - gammaLn(a);
  if (x < a + 1) {
    // A&S 6.5.29: γ(a,x) = e^(−x) x^a Σ xⁿ / (a(a+1)…(a+n))
    let term = 1 / a;
    let sum = term;
    for (let n = 1; n < 10_000; n++) {
      term *= x / (a + n);
      sum += term;
      if (Math.abs(term) < Math.abs(sum) * 1e-16) break;
    }
    return Math.min(1, sum * Math.exp(lnFront));
  }
  // A&S 6.5.31 / Numerical Recipes §6.2: continued fraction for Q(a, x), modified Lentz.
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10_000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-16) break;
  }
  return Math.max(0, 1 - Math.exp(lnFront) * h);
}

function checkDf(df: number): void {
  if (!(df > 0) || !Number.isFinite(df)) throw new RangeError(`degrees of freedom must be a positive number, got ${df}`);
}

/** Chi-square distribution function P(X ≤ x) with df degrees of freedom. */
export function chiSquareCdf(x: number, df: number): number {
  checkDf(df);
  if (x <= 0) return 0;
  return gammaP(df / 2, x / 2);
}

/** Chi-square density with df degrees of freedom. */
function chiSquarePdf(x: number, df: number): number {
  if (x <= 0) return 0;
  const k = df / 2;
  return Math.exp((k - 1) * Math.log(x) - x / 2 - k * Math.LN2 - gammaLn(k));
}

/**
 * Chi-square quantile: the x with P(X ≤ x) = p for df degrees of freedom.
 * @param p probability, 0 < p < 1
 * @param df degrees of freedom, > 0
 */
export function chiSquareQuantile(p: number, df: number): number {
  checkDf(df);
  if (!(p > 0 && p < 1)) throw new RangeError(`probability must lie strictly between 0 and 1, got ${p}`);
  let lo = 0;
  let hi = Math.max(1, df);
  while (chiSquareCdf(hi, df) < p) hi *= 2;
  let x = Math.min(Math.max(df, 1e-3), hi / 2);
  for (let i = 0; i < 200; i++) {
    const f = chiSquareCdf(x, df) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const pdf = chiSquarePdf(x, df);
    let next = pdf > 0 ? x - f / pdf : NaN;
    if (!(next > lo && next < hi)) next = (lo + hi) / 2;
    if (Math.abs(next - x) <= 1e-15 * x) return next;
    x = next;
  }
  return x;
}
