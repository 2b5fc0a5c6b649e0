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
}

const OKE = 'Oke, T. R. (1987), Boundary Layer Climates, 2nd ed., Routledge, Table 1.1 (from memory)'
/** Where the emissivities come from (each SurfaceType's `emissivity`). */
export const EMISSIVITY_SOURCE = 'Oke, T. R. (1987), Boundary Layer Climates, 2nd ed., Routledge, Table 1.1 (from memory)'
const LIOU = 'Liou, K. N. (2002), An Introduction to Atmospheric Radiation, 2nd ed., Academic Press (from memory)'

/** Typical surface albedos (values from memory of the cited textbooks; see each entry's source). */
export const SURFACE_TYPES: readonly SurfaceType[] = Object.freeze([
  { id: 'ocean', emissivity: 0.96, name: 'Open ocean (sun well above the horizon)', albedo: 0.06, range: [0.03, 0.1], source: OKE },
  { id: 'forest', emissivity: 0.98, name: 'Forest (mixed, broadleaf and conifer)', albedo: 0.13, range: [0.05, 0.2], source: OKE },
  { id: 'urban', emissivity: 0.92, name: 'Urban area', albedo: 0.15, range: [0.1, 0.27], source: OKE },
  { id: 'cropland', emissivity: 0.95, name: 'Cropland', albedo: 0.18, range: [0.15, 0.25], source: OKE },
  { id: 'grassland', emissivity: 0.93, name: 'Grassland', albedo: 0.2, range: [0.16, 0.26], source: OKE },
  { id: 'desert-sand', emissivity: 0.9, name: 'Desert sand', albedo: 0.35, range: [0.2, 0.45], source: OKE },
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
