/**
 * Benjamini–Hochberg q-values (Benjamini & Hochberg 1995, JRSS B 57(1)): the smallest false
 * discovery rate at which each hypothesis would be rejected, so that ranking many groups at once
 * does not turn chance deviations into leads. Returned in input order. A p at P_FLOOR ("below
 * 1e-300") gives a q that is an upper bound, which errs on the side of caution.
 */
export function benjaminiHochberg(pValues: readonly number[]): number[] {
  const m = pValues.length
  const order = pValues.map((p, i) => ({ p, i })).sort((a, b) => a.p - b.p)
  const q = new Array<number>(m)
  let running = 1
  for (let rank = m; rank >= 1; rank--) {
    const { p, i } = order[rank - 1]!
    running = Math.min(running, (p * m) / rank)
    q[i] = running
  }
  return q
}
