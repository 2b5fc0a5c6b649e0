// Bench case for the app's response to an edit: each demo sample's figures (optics, forcing and map, as the
// app's worker computes them before the f(RH) curve) from a cold start, then after typical edits with the
// same workspace, whose node cache keeps every Mie evaluation whose particle did not change.
import { demoStudy, evaluateStudy, OpticsWorkspace, type ModeSpec, type Sample, type Study } from '../../src-core/index.ts'
import { median, report } from './timing.ts'

type Edit = (s: Sample, study: Study) => [Sample, Study]

const onLastMode = (change: (m: ModeSpec) => ModeSpec): Edit => (s, study) => {
  if (s.size.kind !== 'modes') return [s, study]
  const modes = s.size.modes.slice()
  modes[modes.length - 1] = change(modes[modes.length - 1])
  return [{ ...s, size: { ...s.size, modes } }, study]
}

const scaleAmount = (m: ModeSpec, f: number): ModeSpec =>
  m.by === 'number' ? { ...m, number_cm3: m.number_cm3 * f } : m.by === 'mass' ? { ...m, mass_ug_m3: m.mass_ug_m3 * f } : m.by === 'volume' ? { ...m, volume_um3_cm3: m.volume_um3_cm3 * f } : m

/** Edits a user makes, each applied to the unedited sample. */
const edits: Record<string, Edit> = {
  amount: onLastMode((m) => scaleAmount(m, 1.2)),
  median: onLastMode((m) => ({ ...m, median_um: m.median_um * 1.05 })),
  width: onLastMode((m) => ({ ...m, gsd: m.gsd + 0.05 })),
  humidity: (s, study) => [{ ...s, rh_percent: Math.min(s.rh_percent + 3, 95) }, study],
  site: (s, study) => [s, { ...study, site: { ...study.site, cloud_fraction: 0.2 } }]
}

const figuresOf = (sample: Sample, study: Study, ws: OpticsWorkspace): number => {
  const start = performance.now()
  evaluateStudy({ ...study, samples: [sample] }, { skipHumidityCurve: true, workspace: ws })
  return performance.now() - start
}

export function benchEditsDemo(): void {
  const study = demoStudy()
  for (const sample of study.samples) {
    const figures: Record<string, number | string> = { sample: sample.name }
    const cold: number[] = []
    for (let r = 0; r < 3; r++) cold.push(figuresOf(sample, study, new OpticsWorkspace()))
    figures.cold_ms = Math.round(median(cold))
    for (const [name, edit] of Object.entries(edits)) {
      const times: number[] = []
      for (let r = 0; r < 3; r++) {
        const ws = new OpticsWorkspace()
        figuresOf(sample, study, ws)
        const [s, st] = edit(sample, study)
        times.push(figuresOf(s, st, ws))
      }
      figures[`${name}_ms`] = Math.round(median(times))
    }
    report('edits-demo', figures)
  }
}
