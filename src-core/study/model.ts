/**
 * The study document: what a user saves in a `.mote` file (JSON inside). These types are the contract
 * between the document (schema, validation, migration in this folder), the optics (src-core/optics)
 * and the app. Units are in the field names.
 */

import type { CampaignSettings } from '../field/campaign-settings.ts'

export const STUDY_FORMAT = 'motebench-study'
export const STUDY_VERSION = 2

/** A lognormal mode, given by number, by volume or by mass (converted exactly by Hatch–Choate). */
export type ModeSpec =
  | { by: 'number'; number_cm3: number; median_um: number; gsd: number; name?: string; composition?: Composition }
  | { by: 'volume'; volume_um3_cm3: number; median_um: number; gsd: number; name?: string; composition?: Composition }
  | { by: 'mass'; mass_ug_m3: number; median_um: number; gsd: number; name?: string; composition?: Composition }

/** What a measured distribution's values are. */
export type BinQuantityName = 'dN/dlogDp' | 'dN' | 'dS/dlogDp' | 'dV/dlogDp' | 'dM/dlogDp'

/** Measured bins from a sizer: diameters as edges (n + 1) or midpoints (n). */
export interface BinsSpec {
  diameters: number[]
  diameter_unit: 'nm' | 'um'
  /** true: `diameters` are the n + 1 bin edges; false: the n midpoints (edges at geometric means). */
  edges: boolean
  quantity: BinQuantityName
  values: number[]
  /** Where the bins came from (file name, time stamp), for the record. */
  source?: string
  /** When the values are the mean of several rows of a sizer time series: how many. */
  rows_averaged?: number
  /** With `rows_averaged`: each bin's standard deviation over those rows (same quantity), kept for the uncertainty tools. */
  spread?: number[]
}

/** One component of a particle, by volume fraction of the dry particle. */
export interface ComponentShare {
  /** Catalogue id (e.g. `ammonium-sulfate`) or the id of one of the study's user materials. */
  material: string
  volume_fraction: number
}

/**
 * How components share a particle.
 * - `volume-average`, `maxwell-garnett`, `bruggeman`: internal mixtures (effective-medium rules). For
 *   Maxwell Garnett the first component is the host.
 * - `core-shell`: the first component is the core, the others (volume-averaged) the shell.
 */
export type MixingName = 'volume-average' | 'maxwell-garnett' | 'bruggeman' | 'core-shell'

export interface Composition {
  components: ComponentShare[]
  mixing: MixingName
  /** Dry density, g cm⁻³; when absent, the volume-weighted mean of the components' densities. */
  density_g_cm3?: number
  /** Hygroscopicity κ; when absent, the volume-weighted mean of the components' κ. */
  kappa?: number
}

/** A sample's size distribution: lognormal modes or measured bins. */
export type SizeSpec = { kind: 'modes'; modes: ModeSpec[] } | { kind: 'bins'; bins: BinsSpec }

/** The vertical extent of the layer the sample fills. */
export type LayerSpec =
  | { kind: 'depth'; depth_m: number }
  | { kind: 'scale-height'; scale_height_m: number }
  | { kind: 'optical-depth'; aod_550: number }

export interface Sample {
  name: string
  notes?: string
  size: SizeSpec
  /** Composition of every mode that has none of its own, and of measured bins. */
  composition: Composition
  rh_percent: number
  /** Which branch of a salt's hysteresis the particles are on. */
  rh_history: 'rising' | 'falling'
  temperature_k?: number
  layer: LayerSpec
}

/** User components of a study (catalogue components need no entry). */
export type UserIndex =
  | { kind: 'constant'; n: number; k: number }
  | { kind: 'table'; rows: [number, number, number][] }
  | { kind: 'expression'; n: string; k: string }

export interface UserMaterialSpec {
  id: string
  name: string
  index: UserIndex
  density_g_cm3: number
  kappa: number
  source?: string
}

export interface Site {
  name?: string
  latitude_deg: number
  day_of_year: number
  cloud_fraction: number
  transmittance: number
  /** Surface id from the list of surfaces, or 'custom' with `surface_albedo`. */
  surface: string
  surface_albedo?: number
  /** Infrared inputs (climate/longwave.ts; each has a default there): surface temperature, K. */
  surface_temperature_k?: number
  /** Broadband thermal-infrared emissivity of the surface, 0.5..1; default the surface type's. */
  surface_emissivity?: number
  /** Height of the aerosol layer's middle above the ground, km. */
  layer_height_km?: number
  /** Precipitable water of the column, cm (g cm⁻²). */
  water_column_cm?: number
}

export interface Study {
  format: typeof STUDY_FORMAT
  version: typeof STUDY_VERSION
  name: string
  notes?: string
  wavelengths_nm: number[]
  samples: Sample[]
  user_materials?: UserMaterialSpec[]
  site: Site
  /** Margin (W m⁻²) below which the verdict is "too close to call". */
  verdict_margin_w_m2?: number
  /** Uncertainty settings, when a study has them (their shape is defined with the uncertainty tools). */
  uncertainty?: Record<string, unknown>
  /** A station's instrument files and the parameters of their record (src-core/field/campaign-settings.ts). */
  campaign?: CampaignSettings
}
