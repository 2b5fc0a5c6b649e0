// The early-started worker of `motebench series` (workers/early.ts) is given the command's arguments and, as soon
// as its modules have loaded, reads the study and the sizer file's first lines itself, as the command will, and
// integrates the bins' kernels (0.1–0.15 s at a low load): they then overlap the main thread's loading of the
// command, its study check and the opening of the file, rather than start once the main thread sends the layout.
// It is a guess: the worker uses these kernels only when the setup and the layout the main thread sends are equal
// to those it guessed (series-worker.ts); otherwise it integrates them from what it was sent, as before. Any
// problem (bad arguments, study, file, or kernels the optics refuse) gives no guess: the command reports it as it
// always did, from its own reading.
import { closeSync, openSync, readFileSync, readSync } from 'node:fs'
import { basename } from 'node:path'
import { createSizerReader, type BinLayout, type Study } from '../../src-core/index.ts'
import { findSample, readWavelengthsNm } from './common.ts'
import { splitTextLines } from './file-lines.ts'
import { readSeriesArgs } from './series-args.ts'
import { SeriesBlockComputer, type SeriesSetup } from './series-row.ts'

/** Bytes of the sizer file read at most for its table's first row (a table recognised later gives no guess). */
const FIRST_BYTES = 1 << 20

/** What the worker guessed, and its kernels integrated (the setup and layout as the main thread would send them). */
export interface SeriesGuess {
  setup: SeriesSetup
  layout: BinLayout
  computer: SeriesBlockComputer
}

/** The setup and layout the command will send for these arguments, as far as they can be told; null when not. */
export function guessSeriesRun(argv: string[]): { setup: SeriesSetup; layout: BinLayout } | null {
  try {
    const a = readSeriesArgs(argv)
    const v = a.values
    // instruments beside the sizer add wavelengths and are read first: no guess
    if (v.scattering !== undefined || v.absorption !== undefined) return null
    // the study's JSON as it is, not checked (the command checks it; the check, zod's schemas, is a fifth of a
    // megabyte of code this thread would load): a study whose check changes it (a default filled in, an older
    // version brought up to date) gives a setup unequal to the command's, and no use of the guess
    const text = readFileSync(a.studyPath, 'utf8')
    const study = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text) as Study
    const { sample } = findSample(study, a.sampleName, 'series')
    const wavelengthsNm = v.wavelengths !== undefined ? readWavelengthsNm(v.wavelengths) : study.wavelengths_nm.slice()
    const setup: SeriesSetup = { sample, userMaterials: study.user_materials ?? [], wavelengthsNm, tolerance: a.tolerance }
    const layout = firstLayout(a.file, a.sizer, a.policy)
    // as the main thread's messages arrive (structured clones), so that they compare equal
    return layout ? structuredClone({ setup, layout }) : null
  } catch {
    return null
  }
}

/** The bin layout the command sends on the file's first row: read from its first 64 kB, else its first FIRST_BYTES. */
function firstLayout(file: string, sizer: ReturnType<typeof readSeriesArgs>['sizer'], policy: 'skip' | 'stop'): BinLayout | null {
  const fd = openSync(file, 'r')
  try {
    for (const size of [1 << 16, FIRST_BYTES]) {
      const bytes = Buffer.allocUnsafe(size)
      let n = 0
      for (let got = 1; got > 0 && n < size; n += got) got = readSync(fd, bytes, n, size - n, n)
      const whole = n < size
      const layout = layoutFrom(bytes, n, whole, file, sizer, policy)
      if (layout || whole) return layout
    }
    return null
  } finally {
    closeSync(fd)
  }
}

/** The layout at the first row of the file's first `n` bytes (`whole`: the whole file), as the command reads it. */
function layoutFrom(bytes: Buffer, n: number, whole: boolean, file: string, sizer: ReturnType<typeof readSeriesArgs>['sizer'], policy: 'skip' | 'stop'): BinLayout | null {
  // whole lines only (a \n byte is never inside a multi-byte character)
  const cut = whole ? n : bytes.lastIndexOf(10, n - 1) + 1
  let layout: BinLayout | null = null
  const reader = createSizerReader({
    ...sizer,
    fileName: basename(file),
    onBadRow: policy,
    reuseBuffer: true,
    onRecord: () => {
      if (layout) return
      const h = reader.header!
      layout = { diameters: h.diameters.slice(), diameter_unit: h.diameterUnit, edges: h.edges, quantity: h.quantity }
    }
  })
  let lineNo = 0
  for (const line of splitTextLines(bytes.toString('utf8', 0, cut))) {
    reader.push(line, ++lineNo)
    if (layout) return layout
  }
  if (whole) reader.end()
  return layout
}

/** The guess with its kernels integrated; null when there is none or the optics refuse it (the command says why). */
export function integrateGuess(argv: string[]): SeriesGuess | null {
  const g = guessSeriesRun(argv)
  if (!g) return null
  const computer = new SeriesBlockComputer(g.setup)
  computer.useLayout(g.layout)
  return computer.ready ? { ...g, computer } : null
}
