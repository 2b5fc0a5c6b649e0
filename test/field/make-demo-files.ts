// Writes the invented demo files resources/field/valley-mobility.csv and valley-aerodynamic.csv: a fictional
// station (Harrowmere Valley) whose mobility sizer (5-minute scans) and aerodynamic sizer (1-minute records, with a
// 40-minute outage) see one known aerosol: the modes of test/field/synthetic.ts, their numbers varying through the
// morning, particle density 1.8 g cm⁻³, spheres (χ = 1). Run: npx tsx test/field/make-demo-files.ts
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { AERODYNAMIC_MIDPOINTS_UM, clock, instrumentValues, KNOWN_MODES, MOBILITY_MIDPOINTS_UM, sizerFile, type Mode } from './synthetic.ts'

export const DEMO_DENSITY = 1.8
export const DEMO_SHAPE_FACTOR = 1

/** The modes at a time: the fine mode grows through the morning, the coarse one rises with the afternoon wind. */
export function demoModes(iso: string): Mode[] {
  const h = (Date.parse(iso) - Date.parse('2026-06-01T08:00:00Z')) / 3600000
  const [fine, coarse] = KNOWN_MODES
  return [
    { ...fine, n: fine.n * (0.7 + 0.1 * h) },
    { ...coarse, n: coarse.n * (0.6 + 0.15 * h) }
  ]
}

export function demoFiles(): { mobility: string; aerodynamic: string } {
  const s = { shapeFactor: DEMO_SHAPE_FACTOR, density: DEMO_DENSITY }
  const round = (v: number) => Number(v.toPrecision(5))
  const mobTimes = clock('2026-06-01T08:00:20Z', 300, 72)
  const aerTimes = clock('2026-06-01T08:00:45Z', 60, 360, (t) => t >= new Date('2026-06-01T10:40:00Z') && t < new Date('2026-06-01T11:20:00Z'))
  const title = (what: string) => [`Harrowmere Valley station (fictional) - ${what} - invented demo data, not a measurement`]
  return {
    mobility: sizerFile({ title: title('mobility sizer, electrical-mobility diameter'), unit: 'nm', midpointsUm: MOBILITY_MIDPOINTS_UM, times: mobTimes, values: (t) => instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, demoModes(t), s).map(round) }),
    aerodynamic: sizerFile({ title: title('aerodynamic sizer, aerodynamic diameter'), unit: 'um', midpointsUm: AERODYNAMIC_MIDPOINTS_UM, times: aerTimes, values: (t) => instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, demoModes(t), s).map(round) })
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const dir = fileURLToPath(new URL('../../resources/field/', import.meta.url))
  mkdirSync(dir, { recursive: true })
  const f = demoFiles()
  writeFileSync(join(dir, 'valley-mobility.csv'), f.mobility)
  writeFileSync(join(dir, 'valley-aerodynamic.csv'), f.aerodynamic)
  process.stdout.write(`wrote ${dir}valley-mobility.csv and valley-aerodynamic.csv\n`)
}
