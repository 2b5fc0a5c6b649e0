// Fields named as the screen names them: "Coastal haze day › mode 1 › median diameter" for the study's path
// samples[0].size.modes[0].median_um (the schema's problems and the drafts are keyed by such paths).
import type { Study } from '../../src-core/index.ts'

/** The words for each field name of the study format, as the editor's labels and column heads say them. */
const WORDS: Record<string, string> = {
  median_um: 'median diameter',
  gsd: 'σg',
  number_cm3: 'number concentration',
  volume_um3_cm3: 'volume concentration',
  mass_ug_m3: 'mass concentration',
  by: 'given by',
  composition: 'composition',
  components: 'components',
  volume_fraction: 'volume fraction',
  material: 'component',
  mixing: 'mixing',
  density_g_cm3: 'dry density',
  kappa: 'hygroscopicity κ',
  rh_percent: 'relative humidity',
  rh_history: 'humidity history',
  temperature_k: 'temperature',
  layer: 'layer',
  depth_m: 'layer depth',
  scale_height_m: 'scale height',
  aod_550: 'AOD at 550 nm',
  size: 'size distribution',
  bins: 'measured bins',
  diameters: 'bin diameters',
  values: 'bin values',
  name: 'name',
  notes: 'notes',
  site: 'Site',
  latitude_deg: 'latitude',
  day_of_year: 'day of year',
  cloud_fraction: 'cloud fraction',
  transmittance: 'transmittance above',
  surface: 'surface',
  surface_albedo: 'surface albedo',
  wavelengths_nm: 'Wavelengths',
  verdict_margin_w_m2: 'Verdict margin',
  user_materials: 'Own components',
  uncertainty: 'Uncertainty',
  index: 'refractive index',
  id: 'id',
  draws: 'draws',
  inputs: 'inputs'
}

/** Words for a field name the list above lacks: its unit suffix dropped, underscores as spaces. */
const plain = (key: string): string => WORDS[key] ?? key.replace(/_(um|nm|m|cm3|ug_m3|percent|deg|k|w_m2)$/, '').replace(/_/g, ' ')

/** Items of lists, by the list's field name: "mode 1", "component 2", "wavelength 3"… */
const ITEM: Record<string, (study: Study | undefined, k: number, parent: unknown) => string> = {
  samples: (study, k) => study?.samples?.[k]?.name?.trim() || `sample ${k + 1}`,
  modes: (_s, k) => `mode ${k + 1}`,
  components: (_s, k) => `component ${k + 1}`,
  wavelengths_nm: (study, k) => (typeof study?.wavelengths_nm?.[k] === 'number' ? `${study.wavelengths_nm[k]} nm` : `wavelength ${k + 1}`),
  user_materials: (study, k) => study?.user_materials?.[k]?.name?.trim() || `own component ${k + 1}`,
  diameters: (_s, k) => `bin ${k + 1}`,
  values: (_s, k) => `bin ${k + 1}`,
  inputs: (_s, k) => `uncertain input ${k + 1}`
}

/** Lists whose name the screen says before the item ("Wavelengths › 550 nm"). */
const TITLED = new Set(['user_materials', 'wavelengths_nm'])

/** Field names that only group others and say nothing a person needs (size.modes[0] is "mode 1"). */
const SILENT = new Set(['size', 'modes', 'samples', 'layer'])

/** The screen's name for the field at `path`, with the sample's name first: "Coastal haze day › mode 1 › median diameter". */
export function screenName(study: Study | undefined, path: string): string {
  if (path === 'document') return 'The study'
  const parts: string[] = []
  let list = ''
  // keys, list indices ([3]) and quoted-free keys with spaces (uncertainty.samples.Winter smoke.inputs[0])
  const tokens = path.match(/\[\d+\]|[^.[\]]+/g) ?? [path]
  tokens.forEach((t, n) => {
    const index = /^\[(\d+)\]$/.exec(t)
    if (index) {
      const item = ITEM[list]
      parts.push(item ? item(study, Number(index[1]), undefined) : `item ${Number(index[1]) + 1}`)
      return
    }
    list = t
    const next = tokens[n + 1]
    if (next && /^\[\d+\]$/.test(next) && ITEM[t]) {
      // the list's name is said by its item ("mode 1"), except for a group the screen titles
      if (TITLED.has(t)) parts.push(WORDS[t])
      return
    }
    if (SILENT.has(t) && next) return
    parts.push(parts.length ? plain(t) : capitalise(plain(t)))
  })
  return parts.join(' › ')
}

/** The field's own name (the last part of its screen name): "median diameter". */
export function fieldLabel(path: string): string {
  const parts = screenName(undefined, path).split(' › ')
  return parts[parts.length - 1]
}

const capitalise = (s: string): string => (s ? s[0].toUpperCase() + s.slice(1) : s)
