// Writes the invented demo files resources/field/valley-nephelometer.csv and valley-absorption.csv, beside the
// valley sizer files (make-demo-files.ts): the same fictional station and the same known aerosol (demoModes), seen
// as the demo study's "Quarry dust event" sample sees it (its composition and humidity), by
// - a nephelometer (1-minute records at :30 s; scattering and hemispheric backscattering at 450, 550, 700 nm) that
//   sees 7°–170° only, so it reads each mode's scattering divided by that mode's truncation factor from
//   src-core's nephelometer tool; it is off from 12:00 to 12:20;
// - an absorption photometer (2-minute records at :10 s; 370, 520 and 880 nm).
// Every number is invented for the demo. Run: npx tsx test/field/make-optical-demo-files.ts
import { mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { computeSampleOptics, demoStudy, nephelometerTruncation, type Sample } from '../../src-core/index.ts'
import { demoModes } from './make-demo-files.ts'
import { clock, KNOWN_MODES } from './synthetic.ts'

export const NEPH_WAVELENGTHS = [450, 550, 700]
export const ABS_WAVELENGTHS = [370, 520, 880]
export const NEPH_ANGLES = { lowDeg: 7, highDeg: 170 }

/** Per mode of KNOWN_MODES at 1 cm⁻³ … its coefficients at the sample's composition and humidity. */
export function perMode() {
  const study = demoStudy()
  const base = study.samples.find((s) => s.name === 'Quarry dust event')!
  return KNOWN_MODES.map((m) => {
    const sample: Sample = { ...base, size: { kind: 'modes', modes: [{ by: 'number', number_cm3: 1, median_um: m.cmdUm, gsd: m.gsd }] } }
    const sca = computeSampleOptics(sample, { ...study, wavelengths_nm: NEPH_WAVELENGTHS }).wavelengths
    const abs = computeSampleOptics(sample, { ...study, wavelengths_nm: ABS_WAVELENGTHS }).wavelengths
    const seen = NEPH_WAVELENGTHS.map((w, i) => {
      const c = nephelometerTruncation(sample, study, NEPH_ANGLES, { wavelengthNm: w })
      return { sca: sca[i].sca / c.total, back: (sca[i].sca * sca[i].backscatter_fraction) / c.backscatter }
    })
    return { seen, abs: abs.map((r) => r.abs) }
  })
}

export function opticalDemoFiles(): { nephelometer: string; absorption: string } {
  const modes = perMode()
  const r4 = (v: number) => String(Number(v.toPrecision(4)))
  const scale = (t: string) => demoModes(t).map((m, i) => m.n / KNOWN_MODES[i].n) // the mode numbers' change in time
  const nephTimes = clock('2026-06-01T08:00:30Z', 60, 360, (t) => t >= new Date('2026-06-01T12:00:00Z') && t < new Date('2026-06-01T12:20:00Z'))
  const absTimes = clock('2026-06-01T08:01:10Z', 120, 180)
  const sum = (t: string, f: (m: (typeof modes)[number]) => number) => scale(t).reduce((a, s, i) => a + s * KNOWN_MODES[i].n * f(modes[i]), 0)
  const title = (what: string) => `# Harrowmere Valley station (fictional) - ${what} - invented demo data, not a measurement`
  const nephelometer = [
    title('integrating nephelometer, dry inlet, sees 7 to 170 degrees'),
    '# units: Mm-1',
    ['time', ...NEPH_WAVELENGTHS.map((w) => `scattering ${w} nm`), ...NEPH_WAVELENGTHS.map((w) => `backscattering ${w} nm`)].join(','),
    ...nephTimes.map((t) => [t, ...NEPH_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.seen[j].sca))), ...NEPH_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.seen[j].back)))].join(','))
  ]
  const absorption = [
    title('filter absorption photometer'),
    '# units: Mm-1',
    ['time', ...ABS_WAVELENGTHS.map((w) => `absorption ${w} nm`)].join(','),
    ...absTimes.map((t) => [t, ...ABS_WAVELENGTHS.map((_, j) => r4(sum(t, (m) => m.abs[j])))].join(','))
  ]
  return { nephelometer: nephelometer.join('\n') + '\n', absorption: absorption.join('\n') + '\n' }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  const dir = fileURLToPath(new URL('../../resources/field/', import.meta.url))
  mkdirSync(dir, { recursive: true })
  const f = opticalDemoFiles()
  writeFileSync(join(dir, 'valley-nephelometer.csv'), f.nephelometer)
  writeFileSync(join(dir, 'valley-absorption.csv'), f.absorption)
  process.stdout.write(`wrote ${dir}valley-nephelometer.csv and valley-absorption.csv\n`)
}
