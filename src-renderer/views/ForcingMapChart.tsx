// The forcing map over surface albedo and ω: one sample's forcing as shading with a numeric colour scale, and
// every shown sample's own zero line (ω = ω_crit for its own β̄ and τ), its net zero line (sunlight + its infrared
// part, dotted) and position, each in its own colour, line style and marker shape.
import { useMemo } from 'preact/hooks'
import { Chart, type Line } from '../charts/Chart.tsx'
import { drawHeat, drawOverlays, MARKER_SHAPES, MARKER_SIGNS, mapScaleMax, scaleGradient, scaleTicks, type MapOverlay } from '../charts/forcingMap.ts'
import { fixed, signed } from '../format.ts'
import type { ShownSample } from '../shown.ts'

type WithResult = ShownSample & { result: NonNullable<ShownSample['result']> }

/** ω_crit of a zero line at a surface albedo (linear between its points). */
function zeroAt(line: [number, number][], rs: number): number {
  for (let k = 0; k + 1 < line.length; k++) {
    const [a, wa] = line[k]
    const [b, wb] = line[k + 1]
    if (rs >= a && rs <= b) return b === a ? wa : wa + ((rs - a) / (b - a)) * (wb - wa)
  }
  return line.length ? line[line.length - 1][1] : NaN
}

/** Whether a line spans a surface albedo (a net zero line covers only the albedos where its ω lies on the map). */
function within(line: [number, number][], rs: number): boolean {
  return line.length > 1 && rs >= line[0][0] && rs <= line[line.length - 1][0]
}

export function ForcingMapChart(p: { ok: WithResult[]; theme: 'light' | 'dark'; stale: boolean; height?: number }) {
  const main = p.ok[0]
  const several = p.ok.length > 1
  const chart = useMemo(() => {
    if (!main) return null
    const map = main.result.map
    const ink = p.theme === 'light' ? '#14171a' : '#eef1f4'
    const halo = p.theme === 'light' ? '#ffffff' : '#14171a'
    const overlays: MapOverlay[] = p.ok.map((x, k) => ({
      zero: x.result.map.zero_line,
      net: x.result.map.net_zero_line,
      sample: x.result.map.sample,
      stroke: several ? x.style.stroke : ink,
      dash: x.style.dash,
      shape: MARKER_SHAPES[k % MARKER_SHAPES.length]
    }))
    const hasNet = (x: WithResult) => x.result.map.net_zero_line.length > 1 && x.result.forcing.longwave_toa_w_m2 !== null
    const lines: Line[] = p.ok.map((x, k) => ({
      label: several
        ? `${x.sample.name}: its zero line (own β̄ ${fixed(x.result.forcing.upscatter_550, 3)})${hasNet(x) ? `, its net zero line dotted (infrared ${signed(x.result.forcing.longwave_toa_w_m2)} W m⁻²)` : ''} and ${MARKER_SIGNS[overlays[k].shape]}`
        : `sunlight zero line (ω = ω_crit) and this sample ${MARKER_SIGNS[overlays[k].shape]}`,
      stroke: overlays[k].stroke,
      dash: x.style.dash
    }))
    if (!several && main.result.map.net_zero_line.length > 1) lines.push({ label: `net zero line (sunlight + infrared ${signed(main.result.forcing.longwave_toa_w_m2)} W m⁻²)`, stroke: ink, dash: [2, 3] })
    // every sample's map, not only the shaded one, sets how low ω reaches: no marker falls below the plot
    const lo = Math.min(...p.ok.map((x) => Math.min(...x.result.map.ssa)))
    const hi = Math.max(...p.ok.map((x) => Math.max(...x.result.map.ssa)))
    const max = mapScaleMax(map)
    return {
      data: [map.surface_albedo, ...lines.map(() => map.surface_albedo.map(() => null))],
      lines,
      under: drawHeat(map, p.theme),
      over: drawOverlays(overlays, ink, halo),
      yRange: [lo, hi] as [number, number],
      max,
      zero: p.ok.map((x, k) => ({
        sample: x.sample.name,
        shape: overlays[k].shape,
        dash: x.style.dashName,
        upscatter: x.result.forcing.upscatter_550,
        surface: x.result.map.sample[0],
        ssa: x.result.map.sample[1],
        critical: zeroAt(x.result.map.zero_line, x.result.map.sample[0]),
        // the net zero line as drawn: its points and its ω at the sample's surface albedo (null where it has none)
        net_points: hasNet(x) ? x.result.map.net_zero_line.length : 0,
        net_critical: hasNet(x) && within(x.result.map.net_zero_line, x.result.map.sample[0]) ? zeroAt(x.result.map.net_zero_line, x.result.map.sample[0]) : null,
        infrared: x.result.forcing.longwave_toa_w_m2,
        verdict: x.result.forcing.verdict
      }))
    }
  }, [...p.ok.map((x) => x.result), p.theme])
  if (!chart || !main) return null
  return (
    <div class="map-wrap" data-testid="forcing-map-wrap" data-zero-lines={JSON.stringify(chart.zero)} data-shaded={main.sample.name}>
      <Chart
        name="forcing-map"
        title={several ? `Forcing over surface albedo and ω: shading for “${main.sample.name}”, a zero line for each sample` : 'Forcing over surface albedo and ω'}
        data={chart.data}
        lines={chart.lines}
        xLabel="Surface albedo Rs"
        yLabel="Single-scattering albedo ω"
        xRange={[0, 1]}
        yRange={chart.yRange}
        theme={p.theme}
        stale={p.stale}
        height={p.height ?? 250}
        drawUnder={chart.under}
        drawOver={chart.over}
      />
      <div class="map-scale" data-testid="map-scale" data-max={chart.max} role="img" aria-label={`Colour scale of the shading: thin-layer forcing of “${main.sample.name}” from ${signed(-chart.max)} to ${signed(chart.max)} W m⁻²`}>
        <div class="map-scale-bar" style={{ background: scaleGradient(p.theme) }} />
        <div class="map-scale-ticks">
          {scaleTicks(chart.max).map((v, k) => (
            <span key={k}>{v === 0 ? '0' : signed(v, 2)}</span>
          ))}
        </div>
        <p class="map-scale-caption">
          W m⁻², thin-layer sunlight forcing {several ? `of “${main.sample.name}”` : 'of this layer'} at each surface albedo and ω: blue cools, brown warms.
          {!several && main.result.forcing.longwave_toa_w_m2 !== null && ` The infrared part adds ${signed(main.result.forcing.longwave_toa_w_m2)} W m⁻² everywhere on the map (it depends on neither); the net is zero on the dotted line.`}
          {several && ' Each sample’s sunlight part cools above its own zero line and warms below it, and its net (sunlight + its infrared part) cools above its own dotted line; the shading is only the first marked sample’s.'}
        </p>
      </div>
    </div>
  )
}
