// The look every chart's axes share: the theme's ink and grid colours, one font, grid lines from the left axis only.
import type uPlot from 'uplot'

export const CHART_FONT = '12px system-ui, "Segoe UI", "DejaVu Sans", sans-serif'

/** An axis in the theme's colours (`side` 1 is the right-hand axis, which draws no grid of its own). */
export function themedAxis(label: string, ink: string, grid: string, side?: number): uPlot.Axis {
  return {
    label,
    stroke: ink,
    font: CHART_FONT,
    labelFont: CHART_FONT,
    ...(side !== undefined ? { side } : {}),
    grid: { stroke: grid, width: 1, show: side !== 1 },
    ticks: { stroke: grid, width: 1 },
    labelSize: 16
  }
}
