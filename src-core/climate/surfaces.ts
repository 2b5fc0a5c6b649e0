/**
 * Typical broadband (solar-weighted) surface albedos for screening estimates. These are single
 * representative values of wide natural ranges (e.g. ocean albedo grows strongly at low sun, snow
 * darkens as it ages); for a site study use a measured or satellite albedo instead.
 */
import { InputError } from '../errors.ts'

export interface SurfaceType {
  /** Lowercase, hyphenated identifier. */
  id: string
  /** Plain-words name. */
  name: string
  /** Typical broadband albedo, 0..1. */
  albedo: number
  /** Typical range [low, high]. */
  range: readonly [number, number]
  /** Where the value comes from. */
  source: string
  /** Typical broadband thermal-infrared emissivity, 0..1 (Oke 1987, Table 1.1; from memory). */
  emissivity: number
  /**
   * For a surface whose emissivity has a strong band structure: one value per infrared band (LONGWAVE_BANDS order),
   * used by the infrared forcing in place of `emissivity` unless the site gives its own; with its source.
   */
  emissivityBands?: readonly number[]
  emissivityBandsSource?: string
}

const OKE = 'Oke, T. R. (1987), Boundary Layer Climates, 2nd ed., Routledge, Table 1.1 (from memory)'
/** Where the emissivities come from (each SurfaceType's `emissivity`). */
export const EMISSIVITY_SOURCE = 'Oke, T. R. (1987), Boundary Layer Climates, 2nd ed., Routledge, Table 1.1 (from memory)'
const LIOU = 'Liou, K. N. (2002), An Introduction to Atmospheric Radiation, 2nd ed., Academic Press (from memory)'

/**
 * Quartz-rich sand by infrared band, 4–5.5, 5.5–7.5, 7.5–8.5, 8.5–9.5, 9.5–10.5, 10.5–11.5, 11.5–12.5, 12.5–14,
 * 14–16, 16–20, 20–25, 25–40 µm: quartz's reststrahlen bands (Si–O stretching at 8–9.5 µm, bending near 20 µm)
 * reflect, so the emissivity dips there (to about 0.7 in the 8.5–9.5 µm band) and is 0.94–0.96 elsewhere in the
 * window. Band means recalled from the laboratory spectra of quartz sands in Salisbury & D'Aria (1992), Remote Sens.
 * Environ. 42:83–106 (from memory, not read from a copy; rounded to 0.01). Their mean weighted by a 290–315 K
 * blackbody is 0.91, Oke's broadband 0.90 within a hundredth.
 */
const QUARTZ_SAND_BANDS: readonly number[] = Object.freeze([0.87, 0.95, 0.9, 0.72, 0.86, 0.95, 0.96, 0.94, 0.96, 0.92, 0.88, 0.94])
const SALISBURY = "Salisbury, J. W. & D'Aria, D. M. (1992), Emissivity of terrestrial materials in the 8–14 µm atmospheric window, Remote Sens. Environ. 42:83–106; quartz sand, band means (from memory)"

/** Typical surface albedos (values from memory of the cited textbooks; see each entry's source). */
export const SURFACE_TYPES: readonly SurfaceType[] = Object.freeze([
  { id: 'ocean', emissivity: 0.96, name: 'Open ocean (sun well above the horizon)', albedo: 0.06, range: [0.03, 0.1], source: OKE },
  { id: 'forest', emissivity: 0.98, name: 'Forest (mixed, broadleaf and conifer)', albedo: 0.13, range: [0.05, 0.2], source: OKE },
  { id: 'urban', emissivity: 0.92, name: 'Urban area', albedo: 0.15, range: [0.1, 0.27], source: OKE },
  { id: 'cropland', emissivity: 0.95, name: 'Cropland', albedo: 0.18, range: [0.15, 0.25], source: OKE },
  { id: 'grassland', emissivity: 0.93, name: 'Grassland', albedo: 0.2, range: [0.16, 0.26], source: OKE },
  { id: 'desert-sand', emissivity: 0.9, emissivityBands: QUARTZ_SAND_BANDS, emissivityBandsSource: SALISBURY, name: 'Desert sand', albedo: 0.35, range: [0.2, 0.45], source: OKE },
  { id: 'sea-ice', emissivity: 0.96, name: 'Sea ice', albedo: 0.6, range: [0.3, 0.8], source: LIOU },
  { id: 'fresh-snow', emissivity: 0.99, name: 'Fresh snow', albedo: 0.85, range: [0.75, 0.95], source: OKE }
].map((s) => Object.freeze({ ...s, range: Object.freeze(s.range) as readonly [number, number] })))

/** Looks up a surface type by id (e.g. 'fresh-snow'); throws InputError for an unknown id. */
export function surfaceTypeById(id: string): SurfaceType {
  const s = SURFACE_TYPES.find((t) => t.id === id)
  if (!s) {
    throw new InputError('surface', `"${id}" is not a known surface type`, `Use one of: ${SURFACE_TYPES.map((t) => t.id).join(', ')}.`)
  }
  return s
}
