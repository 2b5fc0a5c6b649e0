// The arguments of `motebench series`, read in one place: by the command (series.ts) and by its early-started
// worker (series-guess.ts), which reads them to integrate the bins' kernels before the command has loaded, so both
// read them alike. A light module: no optics, no file reading.
import { readArgs, readTolerance, UsageError } from './common.ts'
import { seriesWorkerCount } from './series-early.ts'
import { readSizerFlags, sizerFlags } from './sizer-options.ts'
import type { SizerOptions } from '../../src-core/index.ts'

/** parseArgs definitions of the measured instruments beside the sizer (series-optical.ts reads them). */
export const SERIES_OPTICAL_OPTIONS = {
  scattering: { type: 'string' },
  absorption: { type: 'string' },
  truncation: { type: 'boolean', default: false },
  'neph-angles': { type: 'string' },
  closure: { type: 'boolean', default: false },
  'closure-sd': { type: 'string' }
} as const

export const SERIES_OPTIONS = {
  study: { type: 'string' },
  sample: { type: 'string' },
  wavelengths: { type: 'string' },
  out: { type: 'string' },
  'on-bad-row': { type: 'string' },
  workers: { type: 'string' },
  tolerance: { type: 'string' },
  ...sizerFlags,
  ...SERIES_OPTICAL_OPTIONS,
  shard: { type: 'string' }
} as const

/** The series' arguments read and checked, in the order the command reports their problems. */
export function readSeriesArgs(argv: string[]) {
  const { values, positionals } = readArgs('series', argv, SERIES_OPTIONS, true)
  if (positionals.length !== 1) throw new UsageError('series: give one sizer file, for example "motebench series sizer.csv --study demo.mote --sample NAME"')
  const file = positionals[0]
  if (values.study === undefined) throw new UsageError('series: --study is required, for example --study demo.mote (the sample gives composition, humidity and layer)')
  if (values.sample === undefined) throw new UsageError('series: --sample is required: the name of a sample of the study')
  const policy = values['on-bad-row'] ?? 'skip'
  if (policy !== 'skip' && policy !== 'stop') throw new UsageError(`series: --on-bad-row "${policy}" is not skip or stop`)
  const workers = seriesWorkerCount(values.workers)
  const tolerance = readTolerance(values.tolerance, 1e-4)
  const sizer: SizerOptions = readSizerFlags('series', values)
  return { values, file, studyPath: values.study, sampleName: values.sample, policy: policy as 'skip' | 'stop', workers, tolerance, sizer }
}
