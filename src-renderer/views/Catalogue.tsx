// The components a study can use, as src-core defines them: the built-in catalogue and the study's own
// components, each with its refractive index n + ik at the study's wavelengths and the source of every row,
// its dry density and κ (with their sources), and charts of n and k against wavelength over its tabulated range.
import { useEffect, useMemo, useState } from 'preact/hooks'
import { indexSourceAt, listMaterials, refractiveIndexAt, type Material } from '../../src-core/index.ts'
import { Chart } from '../charts/Chart.tsx'
import { lineStyle } from '../charts/palette.ts'
import { num } from '../format.ts'
import { useApp } from '../state/store.ts'
import { Dialog } from './Dialog.tsx'
import { wavelengthAxis } from './OpticsView.tsx'
import { ownComponentStates } from './ReportInputs.tsx'

let open = false
const listeners = new Set<() => void>()
const setOpen = (v: boolean) => {
  open = v
  for (const l of [...listeners]) l()
}

/** Opens the component catalogue (header of the composition editor, desktop View menu). */
export const openCatalogue = (): void => setOpen(true)

/** One row of the list: a catalogue component, or an own one (which may be unusable as it stands). */
interface Entry {
  key: string
  name: string
  own: boolean
  material?: Material
  problem?: string
}

function entries(study: Parameters<typeof ownComponentStates>[0]): Entry[] {
  return [
    ...listMaterials().map((m) => ({ key: m.id, name: m.name, own: false, material: m })),
    ...ownComponentStates(study).map((o) => ({ key: `own:${o.spec.id}`, name: `${o.spec.name || o.spec.id} (own)`, own: true, material: o.material, problem: o.problem }))
  ]
}

/** The wavelength range where the index is given, in nm ("any" for constants and expressions). */
function rangeText(m: Material): string {
  const [lo, hi] = m.rangeUm
  if (!(lo > 0) || !Number.isFinite(hi)) return 'any wavelength'
  return `${num(lo * 1000, 5)}–${num(hi * 1000, 5)} nm`
}

/** The index at a wavelength, or why there is none. */
function indexAt(m: Material, nm: number): { n: number; k: number; source: string } | { problem: string } {
  try {
    const { n, k } = refractiveIndexAt(m, nm / 1000)
    return { n, k, source: indexSourceAt(m, nm / 1000) }
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e)
    return { problem: /outside its tabulated range/.test(message) ? `not given here (the index is given for ${rangeText(m)})` : message }
  }
}

/** Wavelengths (nm) to draw: the table's own rows, else 61 points spaced evenly in ln λ over the catalogue's span. */
function curveWavelengths(m: Material, studyNm: readonly number[]): number[] {
  if (m.index.kind === 'table') return m.index.wavelengthsUm.map((w) => w * 1000)
  const lo = Math.min(300, ...studyNm)
  const hi = Math.max(2500, ...studyNm)
  return Array.from({ length: 61 }, (_, i) => lo * (hi / lo) ** (i / 60))
}

function Detail(p: { entry: Entry; wavelengths: readonly number[] }) {
  const s = useApp()
  const m = p.entry.material
  const curves = useMemo(() => {
    if (!m) return null
    // the curve's points and the study's wavelengths on one x axis (uPlot's aligned data); the curve passes through
    // the study's points (between rows the index is straight on these log axes), the points only at the study's
    const inRange = p.wavelengths.filter((w) => 'n' in indexAt(m, w))
    const x = [...new Set([...curveWavelengths(m, p.wavelengths), ...inRange])].sort((a, b) => a - b)
    const at = x.map((w) => indexAt(m, w))
    const study = new Set(inRange)
    const n = at.map((r) => ('n' in r ? r.n : null))
    const k = at.map((r) => ('k' in r && r.k > 0 ? r.k : null))
    return { x, n, k, nStudy: n.map((v, i) => (study.has(x[i]) ? v : null)), kStudy: k.map((v, i) => (study.has(x[i]) ? v : null)), anyK: k.some((v) => v !== null) }
  }, [m, p.wavelengths.join()])
  const line = (i: number) => lineStyle(i, s.theme)
  const axis = wavelengthAxis(curves?.x.length ? curves.x : [300, 2500])
  /** Decades for the log k axis, every second or third one when they are many. */
  const kTicks = (() => {
    const ks = (curves?.k ?? []).filter((v): v is number => v !== null)
    if (!ks.length) return undefined
    const lo = Math.floor(Math.log10(Math.min(...ks)))
    const hi = Math.ceil(Math.log10(Math.max(...ks)))
    const step = Math.ceil((hi - lo) / 5)
    return Array.from({ length: Math.floor((hi - lo) / step) + 1 }, (_, i) => 10 ** (lo + i * step))
  })()
  if (!m) {
    return (
      <div class="catalogue-detail" data-testid="catalogue-detail" data-component={p.entry.key}>
        <h3>{p.entry.name}</h3>
        <p class="field-error" role="alert">
          This component cannot be used as it stands: {p.entry.problem}
        </p>
      </div>
    )
  }
  return (
    <div class="catalogue-detail" data-testid="catalogue-detail" data-component={p.entry.key}>
      <h3>{p.entry.name}</h3>
      {curves && (
        <div class="catalogue-charts" data-testid="catalogue-charts">
          <Chart
            name="catalogue-n"
            title={`Real part n of ${p.entry.name}`}
            data={[curves.x, curves.n, curves.nStudy]}
            lines={[
              { label: 'n', ...line(0) },
              { label: 'at the study’s wavelengths', ...line(1), points: true }
            ]}
            xLabel="Wavelength (nm)"
            yLabel="n"
            xLog
            {...axis}
            theme={s.theme}
            height={180}
          />
          {curves.anyK ? (
            <Chart
              name="catalogue-k"
              title={`Imaginary part k of ${p.entry.name}`}
              data={[curves.x, curves.k, curves.kStudy]}
              lines={[
                { label: 'k', ...line(0) },
                { label: 'at the study’s wavelengths', ...line(1), points: true }
              ]}
              xLabel="Wavelength (nm)"
              yLabel="k"
              xLog
              yLog
              yTicks={kTicks}
              yRange={kTicks ? [kTicks[0], kTicks[kTicks.length - 1]] : undefined}
              {...axis}
              theme={s.theme}
              height={180}
            />
          ) : (
            <p class="empty">k = 0 at every wavelength: this component does not absorb.</p>
          )}
        </div>
      )}
      <dl class="catalogue-facts">
        <dt>Dry density</dt>
        <dd data-fact="density">
          {num(m.densityGcm3, 4)} g cm⁻³ <span class="source">{m.sources.density}</span>
        </dd>
        <dt>Hygroscopicity κ</dt>
        <dd data-fact="kappa">
          {num(m.kappa, 4)} <span class="source">{m.sources.kappa}</span>
        </dd>
        {m.phaseChange && (
          <>
            <dt>Deliquescence / efflorescence</dt>
            <dd data-fact="phase-change">
              {num(m.phaseChange.deliquescenceRH, 3)} % / {num(m.phaseChange.efflorescenceRH, 3)} % RH <span class="source">{m.sources.phaseChange}</span>
            </dd>
          </>
        )}
        <dt>Refractive index</dt>
        <dd data-fact="index">
          {m.index.kind === 'table' ? `tabulated at ${m.index.wavelengthsUm.length} wavelengths, ${rangeText(m)}` : m.index.kind === 'constant' ? 'the same at every wavelength' : `n = ${m.index.nExpression}, k = ${m.index.kExpression}`}
          {m.index.kind === 'table' && <span class="detail"> (between rows: n linear and ln k linear in ln λ)</span>}
        </dd>
        {m.notes && (
          <>
            <dt>Notes</dt>
            <dd>{m.notes}</dd>
          </>
        )}
      </dl>
      <table class="grid-table numbers catalogue-index" data-testid="catalogue-index">
        <caption>Refractive index m = n + ik at the study’s wavelengths</caption>
        <thead>
          <tr>
            <th scope="col">λ (nm)</th>
            <th scope="col">n</th>
            <th scope="col">k</th>
            <th scope="col" class="text">Source</th>
          </tr>
        </thead>
        <tbody>
          {p.wavelengths.map((w, i) => {
            const r = indexAt(m, w)
            const before = i > 0 ? indexAt(m, p.wavelengths[i - 1]) : null
            const same = before && 'source' in before && 'source' in r && before.source === r.source
            return (
              <tr key={w} data-wavelength={w}>
                <th scope="row">{num(w, 6)}</th>
                {'n' in r ? (
                  <>
                    <td data-col="n">{num(r.n, 4)}</td>
                    <td data-col="k">{num(r.k, 3)}</td>
                    <td class="text source" data-col="source" title={r.source}>
                      {same ? <span class="same">same as above</span> : r.source}
                    </td>
                  </>
                ) : (
                  <>
                    <td data-col="n">—</td>
                    <td data-col="k">—</td>
                    <td class="text" data-col="source">
                      {r.problem}
                    </td>
                  </>
                )}
              </tr>
            )
          })}
        </tbody>
      </table>
    </div>
  )
}

export function CatalogueDialog() {
  const s = useApp()
  const [, setTick] = useState(0)
  useEffect(() => {
    const l = () => setTick((t) => t + 1)
    listeners.add(l)
    return () => void listeners.delete(l)
  }, [])
  const list = useMemo(() => entries(s.study), [s.study.user_materials, s.study.wavelengths_nm])
  const [chosen, setChosen] = useState<string>(list[0]?.key ?? '')
  if (!open) return null
  const entry = list.find((e) => e.key === chosen) ?? list[0]
  return (
    <Dialog title="Components: refractive index, density, κ and sources" name="catalogue" onClose={() => setOpen(false)} wide>
      <p class="help">
        Every figure here is the one the computation uses (from Motebench’s component catalogue, or the study’s own components). The catalogue’s values were written from the
        published sources named beside them; check them against your own references before relying on a result.
      </p>
      <div class="catalogue">
        <table class="grid-table catalogue-list" data-testid="catalogue-list">
          <caption class="sr-only">Components</caption>
          <thead>
            <tr>
              <th scope="col" class="text">Component</th>
              <th scope="col">Density (g cm⁻³)</th>
              <th scope="col">κ</th>
              <th scope="col" class="text">Index given for</th>
            </tr>
          </thead>
          <tbody>
            {list.map((e) => (
              <tr key={e.key} class={e.key === entry?.key ? 'is-selected' : undefined} data-component={e.key}>
                <th scope="row" class="text">
                  <button type="button" class="link" aria-pressed={e.key === entry?.key} onClick={() => setChosen(e.key)} data-testid="catalogue-pick">
                    {e.name}
                  </button>
                </th>
                <td>{e.material ? num(e.material.densityGcm3, 4) : '—'}</td>
                <td>{e.material ? num(e.material.kappa, 3) : '—'}</td>
                <td class="text">{e.material ? rangeText(e.material) : 'not usable'}</td>
              </tr>
            ))}
          </tbody>
        </table>
        {entry && <Detail entry={entry} wavelengths={s.study.wavelengths_nm} />}
      </div>
      <div class="dialog-buttons">
        <button type="button" onClick={() => setOpen(false)} data-testid="catalogue-close">
          Close
        </button>
      </div>
    </Dialog>
  )
}
