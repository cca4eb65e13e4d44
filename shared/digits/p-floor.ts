/**
 * The smallest p Mantissa reports. Below it a double keeps too few digits (1e-308 is the last
 * normal one), so a smaller p is reported as P_FLOOR and shown as "p < 1e-300", never as 0.
 * Its own file so that the page can print p-values without loading the engine's tail code.
 */
export const P_FLOOR = 1e-300
