/**
 * The built-in material catalogue: spectral refractive index (0.3 µm to at least 2.5 µm), density, hygroscopicity κ
 * and, for crystalline salts, deliquescence/efflorescence humidities — each with its source.
 *
 * Every number here was written from the published literature as recalled by the author of this file, not
 * read from a data file; "(from memory)" marks recalled values. Where a table had to be filled between or beyond
 * recalled points, the row's source says so plainly ("this catalogue's assumption").
 *
 * κ values: Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1 (CCN-derived values, from memory),
 * unless stated otherwise.
 */
import { InputError } from '../errors.ts'
import { buildTableIndex, type Material, type PhaseChange } from './material.ts'

/** One tabulated row: wavelength µm, n, k, and optionally a source for this row that overrides the entry's. */
type Row = readonly [number, number, number, string?]

interface Entry {
  id: string
  name: string
  rows: readonly Row[]
  indexSource: string
  densityGcm3: number
  densitySource: string
  kappa: number
  kappaSource: string
  phaseChange?: PhaseChange
  phaseChangeSource?: string
  notes?: string
}

/** The study's standard grid for components whose source is smooth or nearly constant. */
const GRID = [0.3, 0.35, 0.4, 0.45, 0.5, 0.55, 0.6, 0.65, 0.7, 0.8, 0.9, 1.0, 1.2, 1.5, 2.0, 2.5] as const

// ---------------------------------------------------------------------------------------------------------------
// Water. Hale, G. M. & Querry, M. R. (1973), "Optical constants of water in the 200-nm to 200-µm wavelength
// region", Appl. Opt. 12:555, Table I (from memory). Their table is coarse between 1 and 2.6 µm (0.2 µm steps), so
// the 1.45 µm absorption band peak (k ≈ 3e-4) is not resolved here; k near 1.5 µm interpolates to ≈ 1e-4.
const WATER_SRC = 'Hale & Querry 1973, Appl. Opt. 12:555, Table I (from memory)'
const WATER_ROWS: readonly Row[] = [
  [0.2, 1.396, 1.1e-7],
  [0.25, 1.362, 3.35e-8],
  [0.3, 1.349, 1.6e-8],
  [0.35, 1.343, 2.3e-9],
  [0.4, 1.339, 1.86e-9],
  [0.45, 1.337, 1.02e-9],
  [0.5, 1.335, 1.0e-9],
  [0.55, 1.333, 1.96e-9],
  [0.6, 1.332, 1.09e-8],
  [0.65, 1.331, 1.64e-8],
  [0.7, 1.331, 3.35e-8],
  [0.75, 1.33, 1.56e-7],
  [0.8, 1.329, 1.25e-7],
  [0.85, 1.329, 2.93e-7],
  [0.9, 1.328, 4.86e-7],
  [0.95, 1.327, 2.93e-6],
  [1.0, 1.327, 2.89e-6],
  [1.2, 1.324, 9.89e-6],
  [1.4, 1.321, 1.38e-4],
  [1.6, 1.317, 8.55e-5],
  [1.8, 1.312, 1.15e-4],
  [2.0, 1.306, 1.1e-3],
  [2.2, 1.296, 2.89e-4],
  [2.4, 1.279, 9.56e-4],
  [2.6, 1.242, 3.17e-3],
  [2.65, 1.219, 6.7e-3],
  [2.7, 1.188, 1.9e-2],
  [2.75, 1.157, 5.9e-2],
  [2.8, 1.142, 1.15e-1],
  [2.85, 1.149, 1.85e-1],
  [2.9, 1.201, 2.68e-1],
  [2.95, 1.292, 2.98e-1],
  [3.0, 1.371, 2.72e-1],
  [3.05, 1.426, 2.4e-1],
  [3.1, 1.467, 1.92e-1],
  [3.15, 1.483, 1.35e-1],
  [3.2, 1.478, 9.24e-2],
  [3.25, 1.467, 6.1e-2],
  [3.3, 1.45, 3.68e-2],
  [3.35, 1.432, 2.61e-2],
  [3.4, 1.42, 1.95e-2],
  [3.45, 1.41, 1.32e-2],
  [3.5, 1.4, 9.4e-3],
  [3.6, 1.385, 5.15e-3],
  [3.7, 1.374, 3.6e-3],
  [3.8, 1.364, 3.4e-3],
  [3.9, 1.357, 3.8e-3],
  [4.0, 1.351, 4.6e-3]
]

// ---------------------------------------------------------------------------------------------------------------
// Ammonium sulfate. Toon, O. B., Pollack, J. B. & Khare, B. N. (1976), "The optical constants of several atmospheric
// aerosol species: ammonium sulfate, aluminum oxide, and sodium chloride", J. Geophys. Res. 81:5733 (from memory).
// n ≈ 1.52–1.53 in the visible with weak normal dispersion. k is very small below 1 µm; the near-infrared rise toward
// the 3 µm N–H band is recalled only to an order of magnitude.
const AS_SRC = 'Toon, Pollack & Khare 1976, J. Geophys. Res. 81:5733 (from memory)'
const AS_K_NIR = 'Toon, Pollack & Khare 1976, J. Geophys. Res. 81:5733 (from memory; k recalled to an order of magnitude only)'
const AS_ROWS: readonly Row[] = [
  [0.3, 1.541, 1e-7],
  [0.35, 1.534, 1e-7],
  [0.4, 1.53, 1e-7],
  [0.45, 1.527, 1e-7],
  [0.5, 1.524, 1e-7],
  [0.55, 1.523, 1e-7],
  [0.6, 1.522, 1e-7],
  [0.65, 1.521, 1e-7],
  [0.7, 1.52, 1e-7],
  [0.8, 1.518, 1e-7],
  [0.9, 1.517, 1e-7],
  [1.0, 1.516, 1e-7],
  [1.2, 1.513, 1e-6, AS_K_NIR],
  [1.5, 1.509, 1e-5, AS_K_NIR],
  [2.0, 1.5, 1.5e-4, AS_K_NIR],
  [2.5, 1.483, 1.5e-3, AS_K_NIR]
]

// ---------------------------------------------------------------------------------------------------------------
// Ammonium nitrate. Visible anchor: n = 1.554 at 0.633 µm, Tang, I. N. (1996), "Chemical and size effects of
// hygroscopic aerosols on light scattering coefficients", J. Geophys. Res. 101:19245 (from memory).
// Dispersion: this catalogue's assumption — the ammonium-sulfate n curve above, shifted to pass through the anchor.
// k = 0 (non-absorbing assumed over 0.3–2.5 µm; common practice).
const AN_ANCHOR_N = 1.554
const AN_SRC = 'n: Tang 1996, J. Geophys. Res. 101:19245, 1.554 at 0.633 µm (from memory), spectral shape assumed equal to ammonium sulfate (this catalogue\'s assumption); k = 0 (common practice)'
function ammoniumNitrateRows(): Row[] {
  // ammonium sulfate n at 0.633 µm, linear in ln λ between its 0.6 and 0.65 µm rows
  const t = Math.log(0.633 / 0.6) / Math.log(0.65 / 0.6)
  const asAt633 = 1.522 + t * (1.521 - 1.522)
  const shift = AN_ANCHOR_N - asAt633
  return AS_ROWS.map((r): Row => [r[0], Math.round((r[1] + shift) * 1e4) / 1e4, 0])
}

// ---------------------------------------------------------------------------------------------------------------
// Sea salt (dry). Shettle, E. P. & Fenn, R. W. (1979), "Models for the aerosols of the lower atmosphere and the
// effects of humidity variations on their optical properties", AFGL-TR-79-0214, sea-salt table (from memory).
const SS_SRC = 'Shettle & Fenn 1979, AFGL-TR-79-0214, sea salt (from memory)'
const SS_ROWS: readonly Row[] = [
  [0.2, 1.51, 1.0e-4],
  [0.25, 1.51, 5.0e-6],
  [0.3, 1.51, 2.0e-6],
  [0.337, 1.51, 4.0e-7],
  [0.4, 1.5, 3.0e-8],
  [0.488, 1.5, 2.0e-8],
  [0.515, 1.5, 1.0e-8],
  [0.55, 1.5, 1.0e-8],
  [0.633, 1.49, 2.0e-8],
  [0.694, 1.49, 1.0e-7],
  [0.86, 1.48, 3.0e-6],
  [1.06, 1.47, 2.0e-4],
  [1.3, 1.47, 4.0e-4],
  [1.536, 1.46, 6.0e-4],
  [1.8, 1.45, 8.0e-4],
  [2.0, 1.45, 1.0e-3],
  [2.25, 1.44, 2.0e-3],
  [2.5, 1.43, 4.0e-3]
]

// ---------------------------------------------------------------------------------------------------------------
// Black carbon. Bond, T. C. & Bergstrom, R. W. (2006), "Light absorption by carbonaceous particles: an investigative
// review", Aerosol Sci. Technol. 40:27: recommended 1.95 + 0.79i at 550 nm, here held wavelength-independent over
// 0.3–2.5 µm as they suggest for lack of better spectral data (from memory). Density 1.8 g cm⁻³ (same review).
const BC_SRC = 'Bond & Bergstrom 2006, Aerosol Sci. Technol. 40:27: 1.95 + 0.79i at 550 nm, held constant in wavelength (from memory)'
const BC_ROWS: readonly Row[] = GRID.map((wl): Row => [wl, 1.95, 0.79])

// ---------------------------------------------------------------------------------------------------------------
// Organic matter (non-absorbing, "white" organic carbon): 1.53 + 0i at all wavelengths (common practice; e.g.
// the value used for non-absorbing organics in many global models).
const OM_SRC = '1.53 + 0i, wavelength-independent (common practice)'
const OM_ROWS: readonly Row[] = GRID.map((wl): Row => [wl, 1.53, 0])

// ---------------------------------------------------------------------------------------------------------------
// Brown carbon. k follows a power law k(λ) = 0.168 (λ / 0.35 µm)^−4. The anchor k = 0.168 at 350 nm is the
// imaginary index of biomass-smoke organic carbon from Kirchstetter, T. W., Novakov, T. & Hobbs, P. V. (2004),
// J. Geophys. Res. 109:D21208 (from memory). For particles small compared with λ the absorption scales as k/λ,
// so k ∝ λ^−4 gives an absorption Ångström exponent near 5, inside the 4–6 range reported for organic (brown)
// carbon by Kirchstetter et al. 2004 and Sun, H., Biedermann, L. & Bond, T. C. (2007), Geophys. Res. Lett. 34:L17813
// (from memory). It gives k ≈ 0.028 at 550 nm. n = 1.55 (common practice).
const BRC_K350 = 0.168
const BRC_W = 4
const BRC_SRC = 'k = 0.168 (λ/0.35 µm)^−4: anchor Kirchstetter, Novakov & Hobbs 2004, J. Geophys. Res. 109:D21208 (from memory); exponent chosen for an absorption Ångström exponent ≈ 5 (Kirchstetter et al. 2004; Sun, Biedermann & Bond 2007, Geophys. Res. Lett. 34:L17813; from memory); n = 1.55 (common practice)'
function brownCarbonRows(): Row[] {
  return GRID.map((wl): Row => [wl, 1.55, BRC_K350 * Math.pow(wl / 0.35, -BRC_W)])
}

// ---------------------------------------------------------------------------------------------------------------
// Mineral dust. n and the near-infrared: the "dust-like" component (after Volz 1973) of Shettle & Fenn 1979,
// AFGL-TR-79-0214, also in WMO 1986 (WCP-112) — 1.53 + 0.008i in the visible, n falling toward 1.2 at 2.5 µm
// (from memory). The rise of k into the UV below 0.55 µm is this catalogue's assumption, shaped after the enhanced UV
// absorption of Saharan dust reported by Sinyuk, A., Torres, O. & Dubovik, O. (2003), Geophys. Res. Lett. 30:1081, and
// Dubovik et al. (2002), J. Atmos. Sci. 59:590 (from memory); the numbers are not taken from those papers.
// Note: modern retrievals (Dubovik et al. 2002; Sinyuk et al. 2003) give less absorbing dust, k ≈ 0.001–0.003 at
// 550 nm; 0.008 is the older, more absorbing model value.
const DUST_SRC = 'Shettle & Fenn 1979, AFGL-TR-79-0214, dust-like (after Volz 1973) (from memory)'
const DUST_UV = 'k: UV rise is this catalogue\'s assumption after Sinyuk et al. 2003, Geophys. Res. Lett. 30:1081 and Dubovik et al. 2002, J. Atmos. Sci. 59:590 (from memory); n: Shettle & Fenn 1979 dust-like (from memory)'
const DUST_ROWS: readonly Row[] = [
  [0.3, 1.53, 0.018, DUST_UV],
  [0.35, 1.53, 0.014, DUST_UV],
  [0.4, 1.53, 0.011, DUST_UV],
  [0.45, 1.53, 0.0095, DUST_UV],
  [0.5, 1.53, 0.0085, DUST_UV],
  [0.55, 1.53, 0.008],
  [0.6, 1.53, 0.008],
  [0.65, 1.53, 0.008],
  [0.7, 1.53, 0.008],
  [0.86, 1.52, 0.008],
  [1.06, 1.52, 0.008],
  [1.3, 1.46, 0.008],
  [1.536, 1.4, 0.008],
  [1.8, 1.33, 0.008],
  [2.0, 1.26, 0.008],
  [2.25, 1.22, 0.009],
  [2.5, 1.18, 0.009]
]

// ---------------------------------------------------------------------------------------------------------------
// Sulfuric acid, 75 % H2SO4 by mass (stratospheric/volcanic droplet). Palmer, K. F. & Williams, D. (1975),
// "Optical constants of sulfuric acid; application to the clouds of Venus?", Appl. Opt. 14:208 (from memory):
// n ≈ 1.43 in the visible; k tiny in the visible and rising through the near-infrared water/OH bands (recalled to an
// order of magnitude). Their measurements do not reach 0.3 µm as far as recalled; the 0.3 and 0.35 µm rows continue
// the weak visible dispersion (this catalogue's assumption).
const SA_SRC = 'Palmer & Williams 1975, Appl. Opt. 14:208, 75 % H2SO4 (from memory)'
const SA_NIR = 'Palmer & Williams 1975, Appl. Opt. 14:208, 75 % H2SO4 (from memory; k recalled to an order of magnitude only)'
const SA_UV = 'continuation of the visible dispersion of Palmer & Williams 1975 (this catalogue\'s assumption)'
const SA_ROWS: readonly Row[] = [
  [0.3, 1.452, 1e-8, SA_UV],
  [0.35, 1.445, 1e-8, SA_UV],
  [0.4, 1.44, 1e-8],
  [0.45, 1.437, 1e-8],
  [0.5, 1.434, 1e-8],
  [0.55, 1.432, 1e-8],
  [0.6, 1.431, 1e-8],
  [0.65, 1.43, 1e-8],
  [0.7, 1.429, 1e-8],
  [0.8, 1.427, 1e-7, SA_NIR],
  [0.9, 1.426, 5e-7, SA_NIR],
  [1.0, 1.425, 1.5e-6, SA_NIR],
  [1.2, 1.422, 1e-5, SA_NIR],
  [1.5, 1.418, 1.5e-4, SA_NIR],
  [2.0, 1.405, 1.2e-3, SA_NIR],
  [2.5, 1.38, 6e-3, SA_NIR]
]

const ENTRIES: readonly Entry[] = [
  {
    id: 'water',
    name: 'Water',
    rows: WATER_ROWS,
    indexSource: WATER_SRC,
    densityGcm3: 0.997,
    densitySource: 'liquid water at 298 K, 0.997 g cm⁻³ (CRC Handbook of Chemistry and Physics)',
    kappa: 0,
    kappaSource: 'not applicable: water is the condensing phase itself (κ = 0 so that a water component takes up no extra water)'
  },
  {
    id: 'ammonium-sulfate',
    name: 'Ammonium sulfate',
    rows: AS_ROWS,
    indexSource: AS_SRC,
    densityGcm3: 1.77,
    densitySource: '(NH4)2SO4 crystal 1.77 g cm⁻³ (CRC Handbook of Chemistry and Physics, from memory)',
    kappa: 0.61,
    kappaSource: 'Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1, CCN-derived (from memory); their growth-factor-derived value is lower, ≈ 0.53',
    phaseChange: { deliquescenceRH: 80, efflorescenceRH: 35 },
    phaseChangeSource: 'deliquescence 79.9 % at 298 K, Tang & Munkelwitz 1994, J. Geophys. Res. 99:18801 (from memory); efflorescence ≈ 35 % (reported values 33–40 %, from memory)'
  },
  {
    id: 'ammonium-nitrate',
    name: 'Ammonium nitrate',
    rows: ammoniumNitrateRows(),
    indexSource: AN_SRC,
    densityGcm3: 1.725,
    densitySource: 'NH4NO3 crystal 1.725 g cm⁻³ (CRC Handbook of Chemistry and Physics, from memory)',
    kappa: 0.67,
    kappaSource: 'Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1, CCN-derived (from memory)',
    notes: 'Treated as always liquid above 0 % RH (no hysteresis): ammonium nitrate deliquesces near 62 % RH but rarely effloresces in the atmosphere.'
  },
  {
    id: 'sea-salt',
    name: 'Sea salt',
    rows: SS_ROWS,
    indexSource: SS_SRC,
    densityGcm3: 2.2,
    densitySource: 'dry sea salt ≈ 2.2 g cm⁻³ (common practice; NaCl is 2.165 g cm⁻³, CRC Handbook)',
    kappa: 1.28,
    kappaSource: 'NaCl, Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1, CCN-derived (from memory); real sea salt is somewhat lower, ≈ 1.1 (Zieger et al. 2017, Nature Commun. 8:15883, from memory)',
    phaseChange: { deliquescenceRH: 75, efflorescenceRH: 45 },
    phaseChangeSource: 'NaCl values: deliquescence 75.3 % at 298 K (Tang & Munkelwitz 1993, Atmos. Environ. 27A:467, from memory); efflorescence ≈ 45 % (from memory)'
  },
  {
    id: 'black-carbon',
    name: 'Black carbon',
    rows: BC_ROWS,
    indexSource: BC_SRC,
    densityGcm3: 1.8,
    densitySource: 'Bond & Bergstrom 2006, Aerosol Sci. Technol. 40:27 (from memory)',
    kappa: 0,
    kappaSource: 'fresh soot is hydrophobic, κ ≈ 0 (common practice)'
  },
  {
    id: 'organic-matter',
    name: 'Organic matter (non-absorbing)',
    rows: OM_ROWS,
    indexSource: OM_SRC,
    densityGcm3: 1.4,
    densitySource: 'secondary organic matter ≈ 1.4 g cm⁻³ (common practice)',
    kappa: 0.1,
    kappaSource: 'typical secondary organic aerosol, within the 0.01–0.5 range of Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961 (common practice)'
  },
  {
    id: 'brown-carbon',
    name: 'Brown carbon',
    rows: brownCarbonRows(),
    indexSource: BRC_SRC,
    densityGcm3: 1.5,
    densitySource: 'biomass-burning organic matter ≈ 1.5 g cm⁻³ (common practice)',
    kappa: 0.1,
    kappaSource: 'biomass-burning organic aerosol, within the 0.01–0.5 range of Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961 (common practice)'
  },
  {
    id: 'mineral-dust',
    name: 'Mineral dust',
    rows: DUST_ROWS,
    indexSource: DUST_SRC,
    densityGcm3: 2.6,
    densitySource: 'mineral dust 2.6 g cm⁻³ (common practice; e.g. d\'Almeida, Koepke & Shettle 1991, Atmospheric Aerosols, Deepak, from memory)',
    kappa: 0.03,
    kappaSource: 'Koehler et al. 2009, Geophys. Res. Lett. 36:L08805: κ ≈ 0.01–0.08 for mineral dust (from memory)',
    notes: 'k = 0.008 at 550 nm is the older, more absorbing model value; modern retrievals give about 0.001–0.003.'
  },
  {
    id: 'sulfuric-acid',
    name: 'Sulfuric acid (75 % H2SO4)',
    rows: SA_ROWS,
    indexSource: SA_SRC,
    densityGcm3: 1.67,
    densitySource: '75 % H2SO4 solution at 20 °C, 1.669 g cm⁻³ (CRC Handbook of Chemistry and Physics, from memory)',
    kappa: 0.9,
    kappaSource: 'sulfuric acid, Petters & Kreidenweis 2007, Atmos. Chem. Phys. 7:1961, Table 1 (from memory; approximate)',
    notes: 'The "dry" state here is already a 75 % solution, so applying κ to it adds water on top of water already present; use humidity growth for this component with care.'
  }
]

function buildMaterial(e: Entry): Material {
  const where = `${e.name} (${e.id}) catalogue table`
  const rows = e.rows.map((r) => [r[0], r[1], r[2]] as const)
  const sources = e.rows.map((r) => r[3] ?? e.indexSource)
  const index = buildTableIndex(where, rows, sources)
  const w = index.wavelengthsUm
  const m: Material = {
    id: e.id,
    name: e.name,
    densityGcm3: e.densityGcm3,
    kappa: e.kappa,
    ...(e.phaseChange ? { phaseChange: Object.freeze({ ...e.phaseChange }) } : {}),
    index,
    rangeUm: [w[0], w[w.length - 1]],
    sources: {
      index: e.indexSource,
      density: e.densitySource,
      kappa: e.kappaSource,
      ...(e.phaseChangeSource ? { phaseChange: e.phaseChangeSource } : {})
    },
    ...(e.notes ? { notes: e.notes } : {})
  }
  return Object.freeze(m)
}

const CATALOGUE: readonly Material[] = Object.freeze(ENTRIES.map(buildMaterial))
const BY_ID = new Map(CATALOGUE.map((m) => [m.id, m]))

/** All built-in materials, in catalogue order. The returned array and its materials are frozen. */
export function listMaterials(): readonly Material[] {
  return CATALOGUE
}

/**
 * The built-in material with this id (lowercase, hyphenated, e.g. `ammonium-sulfate`).
 * Throws InputError listing the valid ids for an unknown one.
 */
export function getMaterial(id: string): Material {
  const m = BY_ID.get(id)
  if (!m) {
    const ids = CATALOGUE.map((c) => c.id).join(', ')
    throw new InputError('material id', `"${id}" is not in the catalogue`, `Use one of: ${ids}; or define a user component.`)
  }
  return m
}
