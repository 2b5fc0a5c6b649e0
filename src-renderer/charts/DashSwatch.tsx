// A short stretch of a chart line, in its colour and dash: marks a line in legends, lists and tables.
export function DashSwatch(p: { stroke: string; dash: readonly number[] }) {
  return (
    <svg class="swatch" width="22" height="8" aria-hidden="true">
      <line x1="0" y1="4" x2="22" y2="4" stroke={p.stroke} stroke-width="2.5" stroke-dasharray={p.dash.join(' ')} />
    </svg>
  )
}
