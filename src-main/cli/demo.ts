// motebench demo: writes the demo study (invented data) to DIR/demo.mote.
import { mkdir } from 'node:fs/promises'
import { join } from 'node:path'
import { demoStudy } from '../../src-core/index.ts'
import { saveStudyFile } from '../files.ts'
import { printJson, readArgs } from './common.ts'

export const demoHelp = `motebench demo: writes the demo study (an invented valley station; invented data) to DIR/demo.mote
  --out DIR             directory to write to (default: the current directory; created if missing);
                        an existing demo.mote is kept as demo.mote.bak
  --json                JSON output`

export async function runDemo(argv: string[]): Promise<number> {
  const { values } = readArgs('demo', argv, { out: { type: 'string' }, json: { type: 'boolean', default: false } })
  const dir = values.out ?? '.'
  await mkdir(dir, { recursive: true })
  const path = join(dir, 'demo.mote')
  const study = demoStudy()
  const saved = await saveStudyFile(path, study, { force: true })
  const w = study.wavelengths_nm
  const site = study.site
  if (values.json) {
    printJson({
      file: saved.path,
      backup: saved.backupPath ?? null,
      name: study.name,
      samples: study.samples.map((s) => s.name),
      wavelengths_nm: w,
      site: { name: site.name, latitude_deg: site.latitude_deg, day_of_year: site.day_of_year, surface: site.surface }
    })
    return 0
  }
  const out = process.stdout
  out.write(`wrote ${saved.path}${saved.backupPath ? ` (previous file kept as ${saved.backupPath})` : ''}\n`)
  out.write(`${study.name} (invented demo data)\n`)
  out.write(`site: ${site.name ?? 'unnamed'}, latitude ${site.latitude_deg}°, day ${site.day_of_year}, surface ${site.surface}\n`)
  out.write(`wavelengths: ${w.length}, ${w[0]} to ${w[w.length - 1]} nm\n`)
  out.write(`samples (${study.samples.length}):\n`)
  for (const s of study.samples) out.write(`  ${s.name}: RH ${s.rh_percent} %, ${s.composition.components.map((c) => c.material).join(' + ')} (${s.composition.mixing})\n`)
  return 0
}
