import { floorP } from './tails'
import type { Arc, ArcSums } from './types'

/**
 * Mantissa arc (Rayleigh) test: with m = frac(log10 x), L² = (mean cos 2πm)² + (mean sin 2πm)²
 * and p ≈ exp(−n L²) (Jammalamadaka & SenGupta 2001). Mantissas spread evenly round the circle
 * under Benford's law, so a large L² means they bunch. The p is exp(−n L²) itself, an upper tail,
 * floored at P_FLOOR where it underflows.
 */
export function mantissaArc(sums: ArcSums, n: number): Arc {
  const l2 = (sums.cos / n) ** 2 + (sums.sin / n) ** 2
  return { l2, p: floorP(Math.exp(-n * l2)) }
}

/** Adds one mantissa to running sums; the server does the same with SUM() in SQL. */
export function addToArc(sums: ArcSums, mantissa: number): void {
  sums.cos += Math.cos(2 * Math.PI * mantissa)
  sums.sin += Math.sin(2 * Math.PI * mantissa)
}
