// The record's charts as panels (what each chart draws, its title and axis words) and the time and diameter
// axes' ticks and labels (RecordCharts.tsx builds the charts from them).
import uPlot from 'uplot'
import type { CampaignRecord, RecordColumns, RecordSeriesName } from '../../src-core/index.ts'

export interface PanelLine {
  key: RecordSeriesName
  label: string
  style: number
  axis?: 1
  points?: boolean
}

export interface Panel {
  name: string
  title: string
  yLabel: string
  y2Label?: string
  yLog?: boolean
  lines: PanelLine[]
  height: number
  map?: boolean
}

export function panels(r: CampaignRecord, s: RecordColumns): Panel[] {
  const w = r.chosenNm
  const measured = r.channels.length > 0
  const coef: PanelLine[] = [
    { key: 'ext', label: `σext ${w} nm`, style: 0 },
    { key: 'sca', label: `σsca ${w} nm`, style: 1 },
    { key: 'abs', label: `σabs ${w} nm`, style: 2 }
  ]
  if (Number.isFinite(s.scatteringAtNm)) coef.push({ key: 'sca_meas', label: `σsca measured ${s.scatteringAtNm} nm${s.scatteringCorrected ? ', truncation-corrected' : ''}`, style: 3 })
  if (Number.isFinite(s.absorptionAtNm)) coef.push({ key: 'abs_meas', label: `σabs measured, at ${w} nm`, style: 4 })
  const out: Panel[] = [
    { name: 'record-size', title: 'Size distribution dN/dlogD (cm⁻³)', yLabel: 'Diameter (µm)', yLog: true, lines: [], height: 190, map: true },
    { name: 'record-coefficients', title: `Coefficients at ${w} nm`, yLabel: 'Mm⁻¹', lines: coef, height: 170 }
  ]
  if (measured) {
    const ratio: PanelLine[] = []
    if (Number.isFinite(s.scatteringAtNm)) ratio.push({ key: 'sca_ratio', label: `scattering ${s.scatteringAtNm} nm`, style: 0 })
    if (Number.isFinite(s.absorptionAtNm)) ratio.push({ key: 'abs_ratio', label: `absorption ${w} nm`, style: 1 })
    out.push({ name: 'record-ratio', title: 'Computed / measured', yLabel: 'ratio', lines: ratio, height: 140 })
  }
  out.push(
    { name: 'record-ssa-g', title: `ω and g at ${w} nm`, yLabel: 'no unit', lines: [{ key: 'ssa', label: 'ω', style: 0 }, { key: 'g', label: 'g', style: 1 }], height: 140 },
    { name: 'record-angstrom', title: `Ångström exponent of extinction at ${w} nm (${s.angstromPairNm[0]}–${s.angstromPairNm[1]} nm)`, yLabel: 'å', lines: [{ key: 'angstrom', label: 'å ext', style: 0 }], height: 130 },
    { name: 'record-number-mass', title: 'Dry number and mass', yLabel: 'cm⁻³', y2Label: 'µg m⁻³', lines: [{ key: 'number', label: 'number (cm⁻³)', style: 0 }, { key: 'mass', label: 'mass (µg m⁻³)', style: 1, axis: 1 }], height: 150 }
  )
  return out
}

export function cssVar(name: string, el: Element): string {
  return getComputedStyle(el).getPropertyValue(name).trim() || '#000'
}

/** UTC time labels: the record's clock (a naive clock is shown as written). */
export const tzDate = (ts: number) => uPlot.tzDate(new Date(ts * 1000), 'Etc/UTC')

/**
 * Tick marks of a log diameter axis inside [lo, hi]: each decade, with 2 and 5 too over two decades or less
 * (uPlot's own log splits can loop on short ranges).
 */
export function decadeTicks(lo: number, hi: number): number[] {
  const out: number[] = []
  const steps = Math.log10(hi / lo) > 2 ? [1] : [1, 2, 5]
  for (let d = Math.floor(Math.log10(lo)); d <= Math.ceil(Math.log10(hi)); d++) for (const m of steps) {
    const v = m * 10 ** d
    if (v >= lo && v <= hi) out.push(Number(v.toPrecision(3)))
  }
  return out
}

/** Time ticks in UTC: "HH:MM", with the ISO date under the first tick and under each midnight. */
export function timeLabels(_u: uPlot, splits: number[]): string[] {
  return splits.map((s, i) => {
    const t = new Date(Math.round(s * 1000)).toISOString()
    const hm = t.slice(11, 16)
    return i === 0 || hm === '00:00' ? `${hm}\n${t.slice(0, 10)}` : hm
  })
}
