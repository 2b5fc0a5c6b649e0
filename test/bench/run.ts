// `npm run bench`: one JSON line of figures per case. `npm run bench -- sphere-grid` runs one case.
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
for (const [name, run] of Object.entries(cases)) if (wanted.length === 0 || wanted.includes(name)) await run()
