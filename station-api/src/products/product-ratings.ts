/** Electrical ratings of a product, as stored. Volts and amperes. */
export interface ProductRatings {
  vinMinV: number;
  vinNomV: number;
  vinMaxV: number;
  voutNomV: number;
  ioutRatedA: number;
}

/**
 * Consistency problems of a product's ratings, each with the field to fix; empty when consistent.
 * A buck converter only steps down: ideal CCM duty D = Vout / Vin (volt-second balance) must stay
 * below 1 at the lowest input, so Vout must be below Vin min.
 */
export function ratingProblems(r: ProductRatings): { field: string; problems: string[] }[] {
  const out: { field: string; problems: string[] }[] = [];
  if (!(r.vinMinV <= r.vinNomV)) out.push({ field: 'vinNomV', problems: [`vinNomV (${r.vinNomV} V) must not be below vinMinV (${r.vinMinV} V)`] });
  if (!(r.vinNomV <= r.vinMaxV)) out.push({ field: 'vinMaxV', problems: [`vinMaxV (${r.vinMaxV} V) must not be below vinNomV (${r.vinNomV} V)`] });
  if (!(r.voutNomV < r.vinMinV)) {
    out.push({ field: 'voutNomV', problems: [`voutNomV (${r.voutNomV} V) must be below vinMinV (${r.vinMinV} V): a buck module only steps the voltage down`] });
  }
  return out;
}
