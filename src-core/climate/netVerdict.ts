/**
 * The verdict on the net: the sunlight part (the thin-layer figure the sunlight verdict rests on) plus the
 * infrared part at the top of the atmosphere, with the word for their sum, which part dominates, and the
 * explanation. "Too close to call" is kept on the net, with the same margin.
 */
import { checkFinite, checkRange } from './validate.ts'
import type { ForcingVerdictWord } from './verdict.ts'

export interface NetVerdictInput {
  /** Sunlight (shortwave) TOA forcing, W m⁻². */
  sunlightWm2: number
  /** Infrared (longwave) TOA forcing, W m⁻². */
  infraredWm2: number
  /** |net| below this is "too close to call", W m⁻². */
  marginWm2: number
}

export interface NetVerdict {
  verdict: ForcingVerdictWord
  netWm2: number
  /** The part with the larger magnitude. */
  dominant: 'sunlight' | 'infrared'
  /** One sentence with the three figures. */
  explanation: string
}

function fmt(x: number): string {
  return Number(x.toPrecision(3)).toString().replace(/-/g, '\u2212')
}

const effect = (x: number) => (x < 0 ? 'cooling' : x > 0 ? 'warming' : 'no effect')

export function netVerdict(input: NetVerdictInput): NetVerdict {
  const net = netForcing(input.sunlightWm2, input.infraredWm2)
  checkRange('marginWm2', input.marginWm2, 0, 1e4, 'W m⁻²')
  const verdict: ForcingVerdictWord = Math.abs(net) < input.marginWm2 ? 'too close to call' : net < 0 ? 'cools' : 'warms'
  const dominant = Math.abs(input.infraredWm2) > Math.abs(input.sunlightWm2) ? 'infrared' : 'sunlight'
  const explanation =
    `Net ${fmt(net)} W m⁻² at the top of the atmosphere: sunlight ${fmt(input.sunlightWm2)} W m⁻² (${effect(input.sunlightWm2)}) ` +
    `and thermal infrared ${fmt(input.infraredWm2)} W m⁻² (${effect(input.infraredWm2)}); the ${dominant} part dominates` +
    (verdict === 'too close to call' ? `, and the net is within the margin of ${fmt(input.marginWm2)} W m⁻².` : '.')
  return { verdict, netWm2: net, dominant, explanation }
}

/** The net forcing, sunlight + infrared (W m⁻²), each part checked finite: the number netVerdict judges. */
export function netForcing(sunlightWm2: number, infraredWm2: number): number {
  checkFinite('sunlightWm2', sunlightWm2)
  checkFinite('infraredWm2', infraredWm2)
  return sunlightWm2 + infraredWm2
}
