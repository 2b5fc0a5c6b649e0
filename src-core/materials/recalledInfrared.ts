/**
 * Thermal-infrared rows of the catalogue components for which no open copy of a published table was found
 * (ammonium sulfate, ammonium nitrate, sulfuric acid, black carbon). Each block names the published table its
 * values follow; every value here is recalled, "(from memory)": band positions are reliable, band strengths and
 * widths only to about a factor of two. DEVELOPERS.md lists these components as the catalogue's weakest.
 * Rows are [wavelength µm, n, k].
 */

type Rows = ReadonlyArray<readonly [number, number, number]>

// Ammonium sulfate. Toon, O. B., Pollack, J. B. & Khare, B. N. (1976), J. Geophys. Res. 81:5733 (from memory):
// the N–H stretch near 3.2 µm, the NH4+ bend near 7.1 µm, the strong sulfate ν3 band near 9.0 µm and ν4 near
// 16.2 µm; lattice absorption beyond 20 µm.
export const AS_IR_SRC = 'Toon, Pollack & Khare 1976, J. Geophys. Res. 81:5733 (from memory; band positions reliable, strengths to about a factor of 2)'
export const AS_IR_ROWS: Rows = [
  [2.75, 1.47, 0.005], [3.0, 1.4, 0.06], [3.15, 1.38, 0.13], [3.25, 1.45, 0.14], [3.4, 1.55, 0.08], [3.6, 1.55, 0.02],
  [4.0, 1.51, 0.008], [5.0, 1.47, 0.008], [5.8, 1.45, 0.02], [6.5, 1.38, 0.03], [6.9, 1.25, 0.2], [7.1, 1.35, 0.5],
  [7.3, 1.7, 0.3], [7.6, 1.65, 0.06], [8.0, 1.5, 0.03], [8.5, 1.25, 0.1], [8.8, 1.0, 0.5], [9.0, 1.2, 1.0],
  [9.2, 1.9, 0.9], [9.5, 2.2, 0.25], [10.0, 1.9, 0.05], [11.0, 1.75, 0.03], [12.0, 1.7, 0.03], [13.0, 1.66, 0.03],
  [14.0, 1.63, 0.04], [15.0, 1.58, 0.06], [15.8, 1.5, 0.15], [16.2, 1.55, 0.3], [16.6, 1.75, 0.2], [17.5, 1.7, 0.06],
  [20.0, 1.62, 0.05], [25.0, 1.55, 0.1], [30.0, 1.7, 0.3], [35.0, 1.85, 0.25], [40.0, 1.8, 0.15]
]

// Ammonium nitrate. Jarzembski, M. A., Norman, M. L., Fuller, K. A., Srivastava, V. & Cutten, D. R. (2003),
// "Complex refractive index of ammonium nitrate in the 2–20-µm spectral range", Appl. Opt. 42:922 (from memory):
// the N–H stretch near 3.2 µm, the strong nitrate ν3 band near 7.3 µm and the narrow ν2 band near 12.0 µm.
// Beyond 20 µm (outside their range) the 20 µm value is continued with a slow rise of k (this catalogue's assumption).
export const AN_IR_SRC = 'Jarzembski et al. 2003, Appl. Opt. 42:922 (from memory; band positions reliable, strengths to about a factor of 2)'
export const AN_IR_BEYOND = 'continuation beyond the 20 µm end of Jarzembski et al. 2003 (this catalogue\'s assumption)'
export const AN_IR_ROWS: Rows = [
  [2.75, 1.5, 0.005], [3.0, 1.45, 0.05], [3.2, 1.45, 0.15], [3.4, 1.6, 0.08], [3.7, 1.58, 0.02], [4.5, 1.53, 0.01],
  [5.5, 1.5, 0.01], [6.5, 1.4, 0.05], [7.0, 1.1, 0.4], [7.3, 1.4, 0.9], [7.6, 1.9, 0.5], [8.0, 1.75, 0.08],
  [9.0, 1.62, 0.02], [9.6, 1.6, 0.03], [11.0, 1.55, 0.02], [11.8, 1.45, 0.1], [12.0, 1.55, 0.25], [12.2, 1.7, 0.08],
  [13.0, 1.62, 0.03], [14.0, 1.6, 0.04], [16.0, 1.57, 0.05], [20.0, 1.55, 0.08]
]
export const AN_IR_BEYOND_ROWS: Rows = [[25.0, 1.6, 0.15], [30.0, 1.7, 0.2], [40.0, 1.7, 0.2]]

// Sulfuric acid, 75 % H2SO4. Palmer, K. F. & Williams, D. (1975), Appl. Opt. 14:208 (from memory): the O–H band
// near 3 µm, the water bend near 6.1 µm, the strong S–O bands near 8.5–9 µm and 11 µm, and broad absorption beyond
// 15 µm. Their measurements end near 25 µm; the 30 and 40 µm rows continue the 25 µm value (this catalogue's assumption).
export const SA_IR_SRC = 'Palmer & Williams 1975, Appl. Opt. 14:208, 75 % H2SO4 (from memory; band positions reliable, strengths to about a factor of 2)'
export const SA_IR_BEYOND = 'continuation beyond the ≈ 25 µm end of Palmer & Williams 1975 (this catalogue\'s assumption)'
export const SA_IR_ROWS: Rows = [
  [2.75, 1.36, 0.04], [3.0, 1.38, 0.25], [3.3, 1.47, 0.2], [3.6, 1.45, 0.08], [4.0, 1.41, 0.05], [5.0, 1.38, 0.04],
  [5.8, 1.3, 0.1], [6.1, 1.4, 0.12], [6.5, 1.38, 0.07], [7.5, 1.34, 0.1], [8.0, 1.25, 0.25], [8.5, 1.35, 0.55],
  [9.0, 1.7, 0.55], [9.5, 1.85, 0.3], [10.0, 1.8, 0.25], [10.5, 1.6, 0.35], [11.0, 1.7, 0.55], [11.5, 1.95, 0.4],
  [12.0, 1.95, 0.25], [13.0, 1.8, 0.15], [15.0, 1.75, 0.2], [17.0, 1.8, 0.35], [20.0, 1.9, 0.45], [25.0, 2.0, 0.5]
]
export const SA_IR_BEYOND_ROWS: Rows = [[30.0, 2.0, 0.5], [40.0, 2.0, 0.5]]

// Black carbon beyond 2.5 µm. The dispersion fit for flame soot of Chang, H. & Charalampopoulos, T. T. (1990),
// Proc. R. Soc. Lond. A 430:577 (from memory), valid 0.4–30 µm, with L = ln(λ / µm):
//   n = 1.811 + 0.1263 L + 0.027 L² + 0.0417 L³,   k = 0.5821 + 0.1213 L + 0.2309 L² − 0.0100 L³.
// It gives 1.98 + 0.88i at 2.5 µm, close to the 1.95 + 0.79i held below 2.5 µm. Beyond 30 µm it is continued
// (this catalogue's assumption).
export const BC_IR_SRC = 'Chang & Charalampopoulos 1990, Proc. R. Soc. Lond. A 430:577, soot dispersion fit (from memory)'
export const BC_IR_BEYOND = 'Chang & Charalampopoulos 1990 fit continued beyond its 30 µm end (this catalogue\'s assumption)'
export function sootIndexCC1990(wavelengthUm: number): [number, number] {
  const L = Math.log(wavelengthUm)
  const n = 1.811 + 0.1263 * L + 0.027 * L * L + 0.0417 * L * L * L
  const k = 0.5821 + 0.1213 * L + 0.2309 * L * L - 0.01 * L * L * L
  return [Math.round(n * 1e4) / 1e4, Math.round(k * 1e4) / 1e4]
}

/** Wavelengths (µm) beyond 2.5 µm at which a smooth component (black carbon's dispersion fit) is tabulated. */
export const IR_GRID = [3, 3.5, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 17.5, 20, 25, 30, 35, 40] as const
