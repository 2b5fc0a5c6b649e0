// The hover read-out of the record's charts: the row under the pointer and every figure of it, and the colour
// legend's decade words.
import { lastAtOrBelow, type CampaignRecord, type RecordColumns, type RecordSeriesName } from '../../src-core/index.ts'
import { num } from '../format.ts'

export const iso = (sec: number) => new Date(Math.round(sec * 1000)).toISOString().slice(0, 19) + 'Z'

/** The record row nearest time x (s), or −1. */
export function rowNear(r: CampaignRecord, x: number | undefined): number {
  if (x === undefined || r.times.length === 0) return -1
  const t = x * 1000
  const lo = Math.max(0, lastAtOrBelow(r.times, t))
  return lo + 1 < r.times.length && r.times[lo + 1] - t < t - r.times[lo] ? lo + 1 : lo
}

/** The index of a record row in the charts' full series (rows are in order; breaks come between them). */
export function indexOfRow(s: RecordColumns, row: number): number {
  let lo = 0
  let hi = s.row.length - 1
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    const r = s.row[mid] < 0 ? s.row[mid + 1] ?? Infinity : s.row[mid]
    if (r < row) lo = mid + 1
    else hi = mid
  }
  return s.row[lo] === row ? lo : s.row.indexOf(row)
}

/** 10 to a power in half decades: 10³, 3.2×10³. */
export function decade(e: number): string {
  const whole = Math.floor(e)
  return e - whole > 0.25 ? `3.2×10${sup(whole)}` : `10${sup(whole)}`
}

const SUP = '⁰¹²³⁴⁵⁶⁷⁸⁹'
function sup(e: number): string {
  return (e < 0 ? '⁻' : '') + String(Math.abs(e)).split('').map((d) => SUP[Number(d)]).join('')
}

export function readoutOf(r: CampaignRecord, s: RecordColumns, i: number, row: number): [string, string][] {
  const v = (k: RecordSeriesName, digits = 4) => {
    const x = s.values[k][i]
    return x !== x ? '—' : num(x, digits)
  }
  const out: [string, string][] = [['time', r.timeText[row] || iso(s.x[i])]]
  if (!r.present[row]) {
    out.push(['no distribution', r.gaps.get(row) ?? 'a gap'])
    return out
  }
  const w = r.chosenNm
  out.push([`σext ${w} nm`, `${v('ext')} Mm⁻¹`], [`σsca ${w} nm`, `${v('sca')} Mm⁻¹`], [`σabs ${w} nm`, `${v('abs')} Mm⁻¹`], ['ω', v('ssa', 3)], ['g', v('g', 3)], ['å ext', v('angstrom', 3)], ['number', `${v('number')} cm⁻³`], ['mass', `${v('mass')} µg m⁻³`])
  if (Number.isFinite(s.scatteringAtNm)) out.push([`σsca measured ${s.scatteringAtNm} nm${s.scatteringCorrected ? ', truncation-corrected' : ''}`, `${v('sca_meas')} Mm⁻¹`], ['scattering computed/measured', v('sca_ratio', 3)])
  if (Number.isFinite(s.absorptionAtNm)) out.push([`σabs measured (at ${w} nm)`, `${v('abs_meas')} Mm⁻¹`], ['absorption computed/measured', v('abs_ratio', 3)])
  return out
}
