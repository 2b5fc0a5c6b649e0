// The draws file of `motebench uncertainty`: every draw's input variates and 550 nm figures, one CSV row per draw,
// numbers in full (shortest round-trip) precision, so a report made from the file (--from-draws) is the report of
// the run that drew them. Written by --save-draws (the whole run) and by --shard K/N (its part of the draws, after
// a shard line; `motebench join` puts the parts together into the whole run's file, byte for byte).
import { readFile } from 'node:fs/promises'
import { InputError, UNCERTAINTY_FIGURES, type DrawBlock, type UncertaintyPlan } from '../../src-core/index.ts'
import { csvCell } from './common.ts'

const N_OUT = UNCERTAINTY_FIGURES.length

/** The two head lines (a title naming the run, the column names), each ending in a line break. */
export function drawsHead(plan: UncertaintyPlan, sampleName: string, fingerprint: string): string {
  const title = `uncertainty draws of "${sampleName}" - seed ${plan.seed} - ${plan.sampling} sampling - ${plan.draws} draws at most - run ${fingerprint}`
  const columns = ['draw', ...plan.inputs.map((r) => r.label), ...UNCERTAINTY_FIGURES.map((f) => f.key)]
  // labels may hold commas: quoted as CSV; the numbers below are String(v), which reads back to the same double
  return `${title}\n${columns.map(csvCell).join(',')}\n`
}

/** The rows of a block of draws. */
export function drawsRows(block: DrawBlock, nIn: number): string {
  let text = ''
  for (let i = 0; i < block.count; i++) {
    let row = String(block.start + i)
    for (let j = 0; j < nIn; j++) row += ',' + String(block.inputs[i * nIn + j])
    for (let j = 0; j < N_OUT; j++) row += ',' + String(block.outputs[i * N_OUT + j])
    text += row + '\n'
  }
  return text
}

/** Reads a draws file back (whole, from draw 0, in order) and checks that it is of this run. */
export async function readDraws(path: string, plan: UncertaintyPlan, sampleName: string, fingerprint: string): Promise<DrawBlock> {
  const text = await readFile(path, 'utf8')
  const lines = text.split('\n')
  if (lines[lines.length - 1] === '') lines.pop()
  const head = drawsHead(plan, sampleName, fingerprint).split('\n')
  if (lines[0]?.startsWith('motebench shard ')) throw new InputError(`${path} line 1`, 'this is one shard of a run, not the whole run', `Put the shards together first: motebench join PART... --out ${path.replace(/\.csv$/, '')}-all.csv`)
  if (lines[0] !== head[0]) {
    throw new InputError(`${path} line 1`, `the draws are not of this run (the file says "${lines[0] ?? ''}", this run would say "${head[0]}")`, 'Give the same study, --sample, --draws, --seed, --lhs, --precision and --min-draws as the run that drew them.')
  }
  const nIn = plan.inputs.length
  const width = 1 + nIn + N_OUT
  const count = lines.length - 2
  const inputs = new Float64Array(count * nIn)
  const outputs = new Float64Array(count * N_OUT)
  for (let i = 0; i < count; i++) {
    const cells = lines[i + 2].split(',')
    const where = `${path} line ${i + 3}`
    if (cells.length !== width) throw new InputError(where, `the row has ${cells.length} cells, not ${width}`, 'Use the file as the run or "motebench join" wrote it.')
    if (Number(cells[0]) !== i) throw new InputError(where, `draw ${cells[0]} is where draw ${i} belongs`, 'Join every shard of the run, in order (motebench join).')
    for (let j = 0; j < nIn; j++) inputs[i * nIn + j] = Number(cells[1 + j])
    for (let j = 0; j < N_OUT; j++) outputs[i * N_OUT + j] = Number(cells[1 + nIn + j])
  }
  return { start: 0, count, inputs, outputs }
}
