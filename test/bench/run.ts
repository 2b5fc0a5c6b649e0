// `npm run bench`: one JSON line of figures per case. `npm run bench -- sphere-grid` runs one case. Given more than
// one case (or none: all of them), each runs in a process of its own, as it would alone: a case's peak memory
// (the process's, e.g. `campaign`'s) and its code's warm-up are then its own, not what the cases before it left.
import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { benchSampleDemo } from './optics.bench.ts'
import { benchEditsDemo } from './edit.bench.ts'
import { benchUiEdits } from './ui.bench.ts'
import { benchAngularTable, benchCoatedGrid, benchSphereAngles, benchSphereGrid, benchSphereLarge } from './mie.bench.ts'
import { benchUncertaintyDemo } from './uncertainty.bench.ts'
import { benchSeries } from './series.bench.ts'
import { benchCliStart } from './cli-start.bench.ts'
import { benchSizerRead } from './reader.bench.ts'
import { benchLongwaveDemo } from './longwave.bench.ts'
import { benchCampaign } from './campaign.bench.ts'
import { benchUiCampaign } from './ui-campaign.bench.ts'

const cases: Record<string, () => void | Promise<void>> = {
  'sphere-grid': benchSphereGrid,
  'sphere-large': benchSphereLarge,
  'sphere-angles': benchSphereAngles,
  'angular-table': benchAngularTable,
  'coated-grid': benchCoatedGrid,
  'sample-demo': benchSampleDemo,
  'edits-demo': benchEditsDemo,
  'ui-edits': benchUiEdits,
  series: benchSeries,
  'cli-start': benchCliStart,
  'sizer-read': benchSizerRead,
  'uncertainty-demo': benchUncertaintyDemo,
  'longwave-demo': benchLongwaveDemo,
  campaign: benchCampaign,
  'ui-campaign': benchUiCampaign
}

const wanted = process.argv.slice(2)
for (const name of wanted) if (!cases[name]) throw new Error(`unknown bench case "${name}"; known: ${Object.keys(cases).join(', ')}`)
const names = Object.keys(cases).filter((name) => wanted.length === 0 || wanted.includes(name))
if (names.length === 1) await cases[names[0]]()
else
  for (const name of names) {
    // the same Node and loader (tsx's flags are in execArgv) on this file, with the one case
    const r = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), name], { stdio: 'inherit' })
    if (r.status !== 0) {
      process.stderr.write(`bench case "${name}" failed (exit status ${r.status ?? r.signal}); the cases after it were not run\n`)
      process.exit(1)
    }
  }
