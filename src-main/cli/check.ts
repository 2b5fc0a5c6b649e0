// motebench check: validates a study (.mote) or a sizer export (.csv, .tsv, .txt) and lists every problem.
import { createReadStream } from 'node:fs'
import { readFile } from 'node:fs/promises'
import { basename, extname } from 'node:path'
import { createInterface } from 'node:readline'
import {
  BIN_QUANTITIES,
  createSizerReader,
  InputError,
  parseStudy,
  type BinQuantityName,
  type SizerLayout,
  type SizerOptions,
  type SizerRecord
} from '../../src-core/index.ts'
import { EXIT_BAD_INPUT, EXIT_OK, printJson, readArgs, UsageError } from './common.ts'

export const checkHelp = `motebench check FILE: checks a study or a sizer file and lists every problem
  FILE                  a study (.mote or .json) or a sizer export (.csv, .tsv or .txt)
  --diameter-unit U     sizer files: nm or um, when the file does not say
  --quantity Q          sizer files: ${BIN_QUANTITIES.join(', ')}, when the file does not say
  --layout L            sizer files: single, time-rows or time-columns, when the guess is wrong
  --stop                sizer files: stop at the first bad row instead of listing them all
  --json                JSON output
Exit status 0 when the file is fine, 2 when it has problems.`

const SIZER_EXTENSIONS = new Set(['.csv', '.tsv', '.txt'])
const STUDY_EXTENSIONS = new Set(['.mote', '.json'])

export async function runCheck(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'check',
    argv,
    {
      'diameter-unit': { type: 'string' },
      quantity: { type: 'string' },
      layout: { type: 'string' },
      stop: { type: 'boolean', default: false },
      json: { type: 'boolean', default: false }
    },
    true
  )
  if (positionals.length !== 1) throw new UsageError('check: give one file, for example "motebench check demo.mote"')
  const file = positionals[0]
  const ext = extname(file).toLowerCase()
  if (SIZER_EXTENSIONS.has(ext)) return checkSizer(file, values)
  if (STUDY_EXTENSIONS.has(ext)) return checkStudy(file, values.json)
  throw new UsageError(`check: cannot tell what "${basename(file)}" is from its extension; use .mote for studies, or .csv, .tsv or .txt for sizer files`)
}

async function checkStudy(file: string, json: boolean): Promise<number> {
  const text = await readFile(file, 'utf8')
  const r = parseStudy(text, basename(file))
  if (json) {
    printJson(
      r.ok
        ? { file, kind: 'study', ok: true, problems: [], warnings: r.warnings, samples: r.study.samples.map((s) => s.name), wavelengths_nm: r.study.wavelengths_nm }
        : { file, kind: 'study', ok: false, problems: r.problems, warnings: [] }
    )
    return r.ok ? EXIT_OK : EXIT_BAD_INPUT
  }
  const out = process.stdout
  if (r.ok) {
    out.write(`${file}: a valid study, "${r.study.name}": ${r.study.samples.length} sample${r.study.samples.length === 1 ? '' : 's'}, ${r.study.wavelengths_nm.length} wavelengths\n`)
    for (const w of r.warnings) out.write(`  warning: ${w}\n`)
    return EXIT_OK
  }
  out.write(`${file}: ${r.problems.length} problem${r.problems.length === 1 ? '' : 's'}\n`)
  for (const p of r.problems) out.write(`  ${p.path}: ${p.message}\n    fix: ${p.fix}\n`)
  return EXIT_BAD_INPUT
}

function sizerOptions(file: string, values: { 'diameter-unit'?: string; quantity?: string; layout?: string; stop?: boolean }): SizerOptions {
  const o: SizerOptions = { fileName: basename(file), onBadRow: values.stop ? 'stop' : 'skip' }
  const unit = values['diameter-unit']
  if (unit !== undefined) {
    const u = unit === 'µm' || unit === 'μm' ? 'um' : unit
    if (u !== 'nm' && u !== 'um') throw new UsageError(`check: --diameter-unit "${unit}" is not nm or um`)
    o.diameterUnit = u
  }
  if (values.quantity !== undefined) {
    if (!(BIN_QUANTITIES as readonly string[]).includes(values.quantity)) throw new UsageError(`check: --quantity "${values.quantity}" is not one of ${BIN_QUANTITIES.join(', ')}`)
    o.quantity = values.quantity as BinQuantityName
  }
  if (values.layout !== undefined) {
    if (!['single', 'time-rows', 'time-columns'].includes(values.layout)) throw new UsageError(`check: --layout "${values.layout}" is not single, time-rows or time-columns`)
    o.layout = values.layout as SizerLayout
  }
  return o
}

/** Streams the file line by line: memory stays flat however many rows a time series has. */
async function checkSizer(file: string, values: { 'diameter-unit'?: string; quantity?: string; layout?: string; stop?: boolean; json?: boolean }): Promise<number> {
  const options = sizerOptions(file, values)
  let first: SizerRecord | undefined
  let last: SizerRecord | undefined
  const reader = createSizerReader({
    ...options,
    onRecord: (r) => {
      if (!first) first = { ...r, values: [] }
      last = { ...r, values: [] }
    }
  })
  const stream = createReadStream(file, { encoding: 'utf8' })
  const lines = createInterface({ input: stream, crlfDelay: Infinity })
  let summary
  try {
    for await (const line of lines) reader.push(line)
    summary = reader.end()
  } catch (e) {
    if (!(e instanceof InputError) || !values.json) throw e
    printJson({ file, kind: 'sizer', ok: false, problems: [{ where: e.where, message: e.message, fix: e.fix }] })
    return EXIT_BAD_INPUT
  } finally {
    lines.close()
    stream.destroy()
  }
  const ok = summary.rejectedCount === 0 && summary.recordCount > 0
  if (values.json) {
    printJson({
      file,
      kind: 'sizer',
      ok,
      layout: summary.layout,
      diameter_unit: summary.diameterUnit,
      quantity: summary.quantity,
      edges: summary.edges,
      bins: summary.edges ? summary.diameters.length - 1 : summary.diameters.length,
      diameters: summary.diameters,
      records: summary.recordCount,
      first_time: first?.time,
      last_time: last?.time,
      rejected_count: summary.rejectedCount,
      rejected: summary.rejected
    })
    return ok ? EXIT_OK : EXIT_BAD_INPUT
  }
  const out = process.stdout
  const unit = summary.diameterUnit === 'um' ? 'µm' : 'nm'
  const d = summary.diameters
  const bins = summary.edges ? d.length - 1 : d.length
  out.write(`${file}: sizer table, layout ${summary.layout}, ${summary.quantity}, ${bins} bins${d.length > 0 ? ` from ${d[0]} to ${d[d.length - 1]} ${unit} (${summary.edges ? 'edges' : 'midpoints'})` : ''}\n`)
  out.write(`  ${summary.recordCount} distribution${summary.recordCount === 1 ? '' : 's'} read${first && first.time ? ` (${first.time}${last && last !== first && last.time !== first.time ? ` to ${last.time}` : ''})` : ''}\n`)
  if (summary.recordCount === 0) out.write('  no distribution could be read\n')
  if (summary.rejectedCount > 0) {
    out.write(`  ${summary.rejectedCount} bad row${summary.rejectedCount === 1 ? '' : 's'} or cell${summary.rejectedCount === 1 ? '' : 's'} left out:\n`)
    for (const r of summary.rejected) out.write(`  line ${r.line}${r.column !== undefined ? ` column ${r.column}` : ''}: ${r.reason}\n    fix: ${r.fix}\n`)
    if (summary.rejectedCount > summary.rejected.length) out.write(`  ... and ${summary.rejectedCount - summary.rejected.length} more\n`)
  }
  return ok ? EXIT_OK : EXIT_BAD_INPUT
}
