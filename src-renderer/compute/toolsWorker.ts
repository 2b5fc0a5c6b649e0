// The tools worker: Monte Carlo uncertainty, closure retrievals and instrument corrections, through src-core's
// public API only. One worker per tool, so that a long run of one does not hold up another.
import {
  centralFigures,
  computeDraws,
  drawColumn,
  dryIndicesAt,
  earlyStopPoint,
  InputError,
  mergeDrawBlocks,
  mixRefractiveIndices,
  nephelometerTruncation,
  drawWorkspace,
  planUncertainty,
  probabilityPositive,
  rebinOpcEdges,
  resolveComposition,
  retrieveRefractiveIndex,
  stoppingStandardError,
  studyMaterials,
  summarizeDraws,
  truncateBlock,
  UNCERTAINTY_CHECK_EVERY,
  UNCERTAINTY_FIGURES,
  UNCERTAINTY_VERDICT_FIGURE,
  type DrawBlock,
  type Sample,
  type Study,
  type UncertainInput,
  type UncertaintyPlan,
  type UncertaintySettings,
  type UncertaintyStatus,
  type UserMaterialSpec
} from '../../src-core/index.ts'
import type { FromTools, SampleIndex, ToolProblem, ToTools, TruncationRow } from './toolMessages.ts'

const post = (m: FromTools): void => (self as unknown as Worker).postMessage(m)
const FORCING = UNCERTAINTY_FIGURES.findIndex((f) => f.key === UNCERTAINTY_VERDICT_FIGURE)
/** Runs asked to stop (the uncertainty loop looks between blocks). */
const cancelled = new Set<number>()

function problemOf(e: unknown): ToolProblem {
  if (e instanceof InputError) {
    const rest = e.message.slice(e.where.length + 2)
    const message = e.fix && rest.endsWith(e.fix) ? rest.slice(0, rest.length - e.fix.length).replace(/\.\s*$/, '') : rest
    return { where: e.where, message, fix: e.fix }
  }
  return { where: 'computation', message: e instanceof Error ? e.message : String(e), fix: '' }
}

/** Which uncertain input a planning problem belongs to: from its path, else by planning each input alone. */
function locate(study: Study, sample: string, p: ToolProblem): ToolProblem {
  const m = /^uncertainty\.(samples\[[^\]]*\]|site)\.inputs\[(\d+)\]/.exec(p.where)
  if (m) return { ...p, list: m[1] === 'site' ? 'site' : 'sample', row: Number(m[2]) }
  const settings = (study.uncertainty ?? {}) as UncertaintySettings
  const lists: ['sample' | 'site', UncertainInput[]][] = [
    ['sample', settings.samples?.[sample]?.inputs ?? []],
    ['site', settings.site?.inputs ?? []]
  ]
  for (const [list, inputs] of lists) {
    for (let row = 0; row < inputs.length; row++) {
      try {
        planUncertainty(study, sample, { inputs: [inputs[row]], draws: 1 })
      } catch {
        return { ...p, list, row }
      }
    }
  }
  return p
}

const pause = () => new Promise<void>((ok) => setTimeout(ok, 0))

async function uncertainty(m: Extract<ToTools, { type: 'uncertainty' }>): Promise<void> {
  let plan: UncertaintyPlan
  try {
    plan = planUncertainty(m.study, m.sample)
  } catch (e) {
    post({ type: 'failed', run: m.run, problem: locate(m.study, m.sample, problemOf(e)) })
    return
  }
  if (!plan.inputs.length) {
    post({ type: 'failed', run: m.run, problem: { where: 'uncertain inputs', message: `“${m.sample}” has no uncertain inputs`, fix: 'Add at least one uncertain input.' } })
    return
  }
  const nIn = plan.inputs.length
  const ws = drawWorkspace()
  let merged: DrawBlock = { start: 0, count: 0, inputs: new Float64Array(0), outputs: new Float64Array(0) }
  let status: UncertaintyStatus = 'completed'
  post({ type: 'progress', run: m.run, done: 0, total: plan.draws })
  while (merged.count < plan.draws) {
    await pause()
    if (cancelled.has(m.run)) {
      status = 'cancelled'
      break
    }
    const start = merged.count
    const block = computeDraws(plan, start, Math.min(plan.draws, start + UNCERTAINTY_CHECK_EVERY), ws)
    merged = mergeDrawBlocks([merged, block], nIn)
    const warm = probabilityPositive(drawColumn(merged, FORCING, 'outputs', UNCERTAINTY_FIGURES.length))
    post({ type: 'progress', run: m.run, done: merged.count, total: plan.draws, warm: warm.probability, standardError: stoppingStandardError(warm.positives, warm.count) })
    const stop = earlyStopPoint(plan, merged)
    if (stop !== null) {
      merged = truncateBlock(merged, stop, nIn)
      status = 'precision reached'
      break
    }
  }
  cancelled.delete(m.run)
  if (!merged.count) {
    post({ type: 'failed', run: m.run, problem: { where: 'run', message: 'the run was stopped before any draw was made', fix: 'Run it again and let it make at least one block of draws.' } })
    return
  }
  post({ type: 'uncertainty', run: m.run, result: summarizeDraws(plan, merged, status, centralFigures(plan, ws)) })
}

/** The dry index of a sample's own composition (the one of measured bins and of modes without their own). */
function sampleIndices(sample: Sample, users: UserMaterialSpec[], wavelengths: number[]): SampleIndex[] {
  const own = studyMaterials({ user_materials: users, wavelengths_nm: wavelengths })
  const kind = resolveComposition(sample.composition, own, `sample “${sample.name}”`)
  const modeOwn = sample.size.kind === 'modes' && sample.size.modes.some((x) => x.composition)
  return wavelengths.map((wl) => {
    const d = dryIndicesAt(kind, wl / 1000)
    const notes = [`dry index of “${sample.name}” (${kind.label}${kind.coreShell ? '' : `, ${kind.rule}`})`]
    let m = d.matrix
    if (kind.coreShell && d.core) {
      m = mixRefractiveIndices([d.core, d.matrix], [kind.fractions[0], 1 - kind.fractions[0]], 'volume-average')
      notes.push('core and shell averaged by volume')
    }
    if (modeOwn) notes.push('modes with their own composition are not included')
    return { wavelength_nm: wl, n: m.n, k: m.k, note: notes.join('; ') }
  })
}

function closure(m: Extract<ToTools, { type: 'closure' }>): void {
  const own = studyMaterials({ user_materials: m.userMaterials, wavelengths_nm: [550] })
  const needsDensity = m.sample.size.kind === 'modes' && m.sample.size.modes.some((x) => x.by === 'mass')
  const density = needsDensity ? resolveComposition(m.sample.composition, own, `sample “${m.sample.name}”`).densityGcm3 : undefined
  const result = retrieveRefractiveIndex(
    { size: m.sample.size, density_g_cm3: density, scattering: m.scattering, absorption: m.absorption, backscatter_fraction: m.backscatter },
    { nRange: m.nRange, kRange: m.kRange }
  )
  const wls = [...new Set([...m.scattering, ...m.absorption, ...m.backscatter].map((x) => x.wavelength_nm))].sort((a, b) => a - b)
  let ownIdx: SampleIndex[] = []
  try {
    ownIdx = sampleIndices(m.sample, m.userMaterials, wls)
  } catch {
    /* the comparison is optional */
  }
  post({ type: 'closure', run: m.run, result, own: ownIdx })
}

function truncation(m: Extract<ToTools, { type: 'truncation' }>): void {
  const rows: TruncationRow[] = []
  post({ type: 'progress', run: m.run, done: 0, total: m.wavelengths.length })
  for (const wl of m.wavelengths) {
    const r = nephelometerTruncation(m.sample, { user_materials: m.userMaterials }, { lowDeg: m.lowDeg, highDeg: m.highDeg, response: m.response }, { wavelengthNm: wl, rhPercent: m.rhPercent })
    rows.push(r)
    post({ type: 'progress', run: m.run, done: rows.length, total: m.wavelengths.length })
  }
  post({ type: 'truncation', run: m.run, rows })
}

self.onmessage = (e: MessageEvent<ToTools>) => {
  const m = e.data
  if (m.type === 'cancel') {
    cancelled.add(m.run)
    return
  }
  try {
    if (m.type === 'uncertainty') void uncertainty(m).catch((err) => post({ type: 'failed', run: m.run, problem: problemOf(err) }))
    else if (m.type === 'closure') closure(m)
    else if (m.type === 'truncation') truncation(m)
    else if (m.type === 'sample-index') post({ type: 'sample-index', run: m.run, indices: sampleIndices(m.sample, m.userMaterials, m.wavelengths) })
    else if (m.type === 'rebin') post({ type: 'rebin', run: m.run, result: rebinOpcEdges(m.edges, m.index, { wavelengthNm: m.wavelengthNm, lowDeg: m.lowDeg, highDeg: m.highDeg, calibrationIndex: m.calibration }, { curve: true }) })
  } catch (err) {
    post({ type: 'failed', run: m.run, problem: problemOf(err) })
  }
}
