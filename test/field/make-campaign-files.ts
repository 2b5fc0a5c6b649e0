// Writes the invented campaign resources/field/campaign-*.csv: three days at a fictional station (Harrowmere
// Valley), 5-minute records of a mobility sizer, an aerodynamic sizer, a nephelometer and an absorption photometer
// seeing one known aerosol (the modes of synthetic.ts, density 1.8 g cm⁻³, spheres): the fine mode follows the
// day, the coarse mode rises in a dust episode on the second afternoon. The mobility sizer is off for two hours on
// the second morning (a gap), and a few rows are bad (a cell that is not a number, a time that cannot be read).
// The measured files are made as make-optical-demo-files.ts makes them (the "Quarry dust event" sample's
// composition and humidity; the nephelometer sees 7°–170°). Every number is invented. Run:
// npx tsx test/field/make-campaign-files.ts
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { DEMO_DENSITY, DEMO_SHAPE_FACTOR } from './make-demo-files.ts'
import { ABS_WAVELENGTHS, NEPH_WAVELENGTHS, perMode } from './make-optical-demo-files.ts'
import { AERODYNAMIC_MIDPOINTS_UM, clock, instrumentValues, KNOWN_MODES, MOBILITY_MIDPOINTS_UM, sizerFile, type Mode } from './synthetic.ts'

export const CAMPAIGN_START = '2026-07-14T00:00:00Z'
export const CAMPAIGN_STEPS = 3 * 288
/** The mobility sizer's outage. */
export const CAMPAIGN_GAP: [string, string] = ['2026-07-15T06:00:00Z', '2026-07-15T08:00:00Z']
/** The dust episode (the coarse mode up to eight times its base). */
export const CAMPAIGN_EPISODE: [string, string] = ['2026-07-15T13:00:00Z', '2026-07-15T19:00:00Z']

/** The two modes' numbers relative to KNOWN_MODES at a time. */
export function campaignScales(iso: string): [number, number] {
  const t = Date.parse(iso)
  const hour = ((t - Date.parse(CAMPAIGN_START)) / 3600000) % 24
  const fine = 0.8 + 0.5 * Math.sin(((hour - 9) / 24) * 2 * Math.PI) ** 2
  const [a, b] = CAMPAIGN_EPISODE.map(Date.parse)
  const inside = t >= a && t < b ? Math.sin(((t - a) / (b - a)) * Math.PI) : 0
  return [fine, 0.5 + 7.5 * inside]
}

export function campaignModes(iso: string): Mode[] {
  const [f, c] = campaignScales(iso)
  return [
    { ...KNOWN_MODES[0], n: KNOWN_MODES[0].n * f },
    { ...KNOWN_MODES[1], n: KNOWN_MODES[1].n * c }
  ]
}

/** Replaces one cell of the data row stamped `time` (1-based column after the time) by `text`. */
function spoil(file: string, time: string, column: number, text: string): string {
  return file
    .split('\n')
    .map((l) => {
      if (!l.startsWith(time)) return l
      const c = l.split(',')
      c[column] = text
      return c.join(',')
    })
    .join('\n')
}

export function campaignFiles(): Record<'mobility' | 'aerodynamic' | 'nephelometer' | 'absorption', string> {
  const s = { shapeFactor: DEMO_SHAPE_FACTOR, density: DEMO_DENSITY }
  const round = (v: number) => Number(v.toPrecision(5))
  const [g0, g1] = CAMPAIGN_GAP.map((x) => new Date(x))
  const mobTimes = clock('2026-07-14T00:00:20Z', 300, CAMPAIGN_STEPS, (t) => t >= g0 && t < g1)
  const aerTimes = clock('2026-07-14T00:00:45Z', 300, CAMPAIGN_STEPS)
  const title = (what: string) => [`Harrowmere Valley station (fictional) - ${what} - invented campaign data, not a measurement`]
  let mobility = sizerFile({ title: title('mobility sizer, electrical-mobility diameter'), unit: 'nm', midpointsUm: MOBILITY_MIDPOINTS_UM, times: mobTimes, values: (t) => instrumentValues('mobility', MOBILITY_MIDPOINTS_UM, campaignModes(t), s).map(round) })
  mobility = spoil(mobility, '2026-07-14T10:00:20Z', 12, 'err')
  mobility = spoil(mobility, '2026-07-16T15:30:20Z', 30, 'n/a?')
  const aerodynamic = sizerFile({ title: title('aerodynamic sizer, aerodynamic diameter'), unit: 'um', midpointsUm: AERODYNAMIC_MIDPOINTS_UM, times: aerTimes, values: (t) => instrumentValues('aerodynamic', AERODYNAMIC_MIDPOINTS_UM, campaignModes(t), s).map(round) })
  const modes = perMode()
  const r4 = (v: number) => String(Number(v.toPrecision(4)))
  const sum = (t: string, f: (m: (typeof modes)[number]) => number) => campaignScales(t).reduce((a, sc, i) => a + sc * KNOWN_MODES[i].n * f(modes[i]), 0)
  const nephTimes = clock('2026-07-14T00:01:30Z', 300, CAMPAIGN_STEPS)
  const absTimes = clock('2026-07-14T00:02:10Z', 300, CAMPAIGN_STEPS)
  const head = (what: string) => `# ${title(what)[0]}`
  let nephelometer = [
    head('integrating nephelometer, dry inlet, sees 7 to 170 degrees'),
    '# units: Mm-1',
    ['time', ...NEPH_WAVELENGTHS.map((w) => `scattering ${w} nm`), ...NEPH_WAVELENGTHS.map((w) => `backscattering ${w} nm`)].join(','),
    ...nephTimes.map((t) => [t, ...NEPH_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.seen[j].sca))), ...NEPH_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.seen[j].back)))].join(','))
  ].join('\n') + '\n'
  nephelometer = nephelometer.replace('2026-07-16T03:01:30Z', '2026-07-16T03:01:3OZ')
  let absorption = [
    head('filter absorption photometer'),
    '# units: Mm-1',
    ['time', ...ABS_WAVELENGTHS.map((w) => `absorption ${w} nm`)].join(','),
    ...absTimes.map((t) => [t, ...ABS_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.abs[j])))].join(','))
  ].join('\n') + '\n'
  absorption = spoil(absorption, '2026-07-14T20:02:10Z', 2, 'x')
  return { mobility, aerodynamic, nephelometer, absorption }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const dir = fileURLToPath(new URL('../../resources/field/', import.meta.url))
  mkdirSync(dir, { recursive: true })
  const f = campaignFiles()
  for (const [k, text] of Object.entries(f)) writeFileSync(join(dir, `campaign-${k}.csv`), text)
  process.stdout.write(`wrote ${dir}campaign-{mobility,aerodynamic,nephelometer,absorption}.csv\n`)
}
