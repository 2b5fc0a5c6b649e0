// motebench check: validates a study (.mote) or a sizer export (.csv, .tsv, .txt) and lists every problem.
import { createReadStream } from 'node:fs'
import { readFile } from 'node:fs/promises'
import { basename, extname } from 'node:path'
import { createInterface } from 'node:readline'
import { binCount, createSizerReader, InputError, parseStudy, type SizerOptions } from '../../src-core/index.ts'
import { EXIT_BAD_INPUT, EXIT_OK, printJson, readArgs, UsageError } from './common.ts'
import { readingLines, readSizerFlags, sizerFlags, sizerHelp, type SizerFlagValues } from './sizer-options.ts'

export const checkHelp = `motebench check FILE: checks a study or a sizer file and lists every problem
  FILE                  a study (.mote or .json) or a sizer export (.csv, .tsv or .txt)
${sizerHelp('sizer files: ')}
  --stop                sizer files: stop at the first bad row instead of listing them all
  --json                JSON output
A sizer file's summary says how the table was read: bins, time columns and format, the columns ignored,
what was inferred (e.g. the diameter unit), and every row left out with its line, column and fix.
Exit status 0 when the file is fine, 2 when it has problems.`

const SIZER_EXTENSIONS = new Set(['.csv', '.tsv', '.txt'])
const STUDY_EXTENSIONS = new Set(['.mote', '.json'])

export async function runCheck(argv: string[]): Promise<number> {
  const { values, positionals } = readArgs(
    'check',
    argv,
    {
      ...sizerFlags,
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

function sizerOptions(file: string, values: SizerFlagValues & { stop?: boolean }): SizerOptions {
  return { ...readSizerFlags('check', values), fileName: basename(file), onBadRow: values.stop ? 'stop' : 'skip' }
}

/** Streams the file line by line: memory stays flat however many rows a time series has. */
async function checkSizer(file: string, values: SizerFlagValues & { stop?: boolean; json?: boolean }): Promise<number> {
  const options = sizerOptions(file, values)
  const reader = createSizerReader({ ...options, reuseBuffer: true })
  const stream = createReadStream(file, { encoding: 'utf8' })
  const lines = createInterface({ input: stream, crlfDelay: Infinity })
  let summary
  try {
    for await (const line of lines) reader.push(line)
    summary = reader.end()
  } catch (e) {
    if (!(e instanceof InputError) || !values.json) throw e
    printJson({ file, kind: 'sizer', ok: false, problems: [{ where: e.where, message: e.message, fix: e.fix, ...('choice' in e ? { choice: e.choice } : {}) }] })
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
      bins: binCount(summary),
      diameters: summary.diameters,
      records: summary.recordCount,
      first_time: summary.firstTime,
      last_time: summary.lastTime,
      time_columns: summary.timeColumns,
      time_format: summary.timeFormat,
      ...(summary.dateOrder ? { date_order: summary.dateOrder } : {}),
      ignored_columns: summary.ignoredColumns,
      units_line: summary.unitsLine,
      diameter_unit_from: summary.unitSource,
      notes: summary.notes,
      negatives_zeroed: summary.negativesZeroed,
      rows_left_out: summary.rowsLeftOut,
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
  out.write(`  ${summary.recordCount} distribution${summary.recordCount === 1 ? '' : 's'} read${summary.firstTime ? ` (${summary.firstTime}${summary.lastTime !== summary.firstTime ? ` to ${summary.lastTime}` : ''})` : ''}\n`)
  for (const l of readingLines(summary)) out.write(`  ${l}\n`)
  if (summary.recordCount === 0) out.write('  no distribution could be read\n')
  if (summary.rejectedCount > 0) {
    out.write(`  ${summary.rowsLeftOut} row${summary.rowsLeftOut === 1 ? '' : 's'} left out (${summary.rejectedCount} bad cell${summary.rejectedCount === 1 ? '' : 's'}):\n`)
    for (const r of summary.rejected) out.write(`  line ${r.line}${r.column !== undefined ? ` column ${r.column}` : ''}: ${r.reason}\n    fix: ${r.fix}\n`)
    if (summary.rejectedCount > summary.rejected.length) out.write(`  ... and ${summary.rejectedCount - summary.rejected.length} more\n`)
  }
  return ok ? EXIT_OK : EXIT_BAD_INPUT
}
