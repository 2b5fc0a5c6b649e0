// The cautions shown on first start, always reachable (header button, F1) and printed in every report.
import { FORCING_CAUTION } from '../src-core/index.ts'

export const HEALTH_CAUTIONS: string[] = [
  'Fine and ultrafine particles reach deep into the lungs. When sampling or handling aerosols, filters and dusts, wear respiratory protection suited to the material (at least a particle-filtering respirator of the class your rules require), work with local exhaust ventilation where possible, and keep exposure below the occupational exposure limits that apply where you work.',
  'Soot and diesel exhaust particles are classed as carcinogenic to humans; avoid skin contact and inhalation when changing filters or cleaning inlets, and do not dry-sweep deposits.',
  'Respirable crystalline silica (quarry, construction and desert dusts) causes silicosis and lung cancer. Treat mineral dust samples as containing it unless shown otherwise; wet methods and enclosed handling reduce exposure.',
  'Follow your local occupational-health rules, the safety data sheets of the materials, and your organisation’s procedures; this software does not assess exposure or health risk.'
]

export const ESTIMATE_CAUTION = `${FORCING_CAUTION} The optics assume spherical particles (Mie theory) and the listed refractive indices; the forcing figure is a screening number for comparing samples, not a prediction of temperature change.`

export const FIRST_START_KEY = 'motebench.cautions-seen'
