/**
 * Growth factors near saturation, said in words. κ-Köhler growth (Petters & Kreidenweis 2007, Atmos. Chem. Phys.
 * 7:1961) steepens without bound as RH → 100 %: without the Kelvin term gf³ = 1 + κ RH/(100 − RH), so
 *   d ln gf / dRH = (100 κ/3) / ((100 − RH)(100 − RH + κ RH))   per percent RH,
 * 6.5 % per percent at 95 % RH for κ = 0.61 against 1.5 % at 80 %. There an RH reading's usual uncertainty of a
 * few percent (common practice for capacitive sensors near saturation) changes the wet size, and with it the
 * optics, by tens of percent, and haze turns into fog droplets the screening computation does not describe.
 */

/** RH (percent) from which growth factors carry a warning: 95. */
export const NEAR_SATURATION_RH = 95

/** Relative change of the growth factor per percent RH, κ-Köhler without the Kelvin term (see above). */
export function growthSensitivityPerPercent(kappa: number, rhPercent: number): number {
  const s = 100 - rhPercent
  return (100 * kappa) / 3 / (s * (s + kappa * rhPercent))
}

/**
 * The warning a growth factor at RH ≥ NEAR_SATURATION_RH carries (κ > 0: the particle takes up water), else null.
 * `what` names the figures that rest on it (e.g. "The wet figures of this sample").
 */
export function nearSaturationWarning(rhPercent: number, kappa: number, what = 'This growth factor'): string | null {
  if (!(rhPercent >= NEAR_SATURATION_RH && rhPercent < 100 && kappa > 0)) return null
  const pct = Number((100 * growthSensitivityPerPercent(kappa, rhPercent)).toPrecision(2))
  return (
    `${what} at ${rhPercent} % RH: near saturation (from ${NEAR_SATURATION_RH} %) κ-Köhler growth is too steep to trust, ` +
    `a 1 % error in RH changes the wet diameter by about ${pct} % (κ = ${Number(kappa.toPrecision(3))}), and haze turns into fog. ` +
    `Use a measured wet size distribution or scattering growth f(RH) instead, or give the figures at a lower RH as a bound.`
  )
}
