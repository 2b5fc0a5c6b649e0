/**
 * The root of f(x) = target for an increasing f on x > 0, by bisection in ln x: the bracket is widened from
 * `guess` by factors of 2, then halved (geometric midpoints) until it is 1e-15 wide relative, or 200 steps.
 * Domain: f continuous and strictly increasing on (0, ∞), target inside its range, guess > 0. Used for the
 * equivalent diameters, whose defining relations with the slip correction are implicit but monotone
 * (DeCarlo et al. 2004, Aerosol Sci. Technol. 38:1185).
 */
export function solveIncreasing(f: (x: number) => number, target: number, guess: number): number {
  let lo = guess
  let hi = guess
  while (f(lo) > target) lo /= 2
  while (f(hi) < target) hi *= 2
  for (let i = 0; i < 200; i++) {
    const mid = Math.sqrt(lo * hi)
    if (f(mid) < target) lo = mid
    else hi = mid
    if (hi / lo - 1 < 1e-15) break
  }
  return Math.sqrt(lo * hi)
}
