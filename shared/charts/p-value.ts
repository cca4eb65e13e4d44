import { P_FLOOR } from '../digits'

/**
 * A p- or q-value as every surface prints it: two significant figures, an exponent below 0.001,
 * and "< 1e-300" at the floor (where the engine stops counting digits), never 0.
 */
export function formatP(p: number | null | undefined, name = 'p'): string {
  if (p === null || p === undefined || Number.isNaN(p)) return `${name} —`
  if (p <= P_FLOOR) return `${name} < 1e-300`
  if (p < 0.001) return `${name} = ${p.toExponential(1)}`
  return `${name} = ${Number(p.toPrecision(2))}`
}

/** The value alone, for table cells: "0.52", "1.9e-17", "< 1e-300". */
export function formatPValue(p: number | null | undefined): string {
  return formatP(p, '').replace(/^ = /, '').trim()
}
