// Pieces the result views share.
import { PREVIEW_TOLERANCE } from '../compute/messages.ts'
import type { ShownSample } from '../shown.ts'
import { useApp } from '../state/store.ts'
import { DashSwatch } from '../charts/DashSwatch.tsx'

/** Says when results on screen are not from the current inputs, and why. */
export function StaleNote(p: { shown: ShownSample[] }) {
  const running = useApp().job.running
  const stale = p.shown.filter((x) => x.stale && x.result)
  const missing = p.shown.filter((x) => !x.result)
  const preview = p.shown.filter((x) => x.preview)
  if (!stale.length && !missing.length) {
    if (!preview.length) return null
    return (
      <div class="preview-note" role="status" data-testid="preview-note">
        <p>
          <strong>{running ? 'Refining:' : 'Quick figures:'}</strong> the figures of {preview.map((x) => `“${x.sample.name}”`).join(', ')} are from a quick first pass (to about
          {' '}{PREVIEW_TOLERANCE * 100} % of σext, so a small σabs may be further off);{' '}
          {running ? 'the full computation is running and replaces them.' : 'the full computation was stopped: the next edit starts it again.'}
        </p>
      </div>
    )
  }
  return (
    <div class="stale-note" role="status" data-testid="stale-note">
      {stale.length > 0 && (
        <p>
          <strong>Stale:</strong> the results of {stale.map((x) => `“${x.sample.name}”`).join(', ')} are from earlier inputs; they update when the inputs are complete and valid.
          {stale.some((x) => x.error) ? ` ${stale.find((x) => x.error)?.error}` : ''}
        </p>
      )}
      {missing.map((x) => (
        <p key={x.id}>
          <strong>No results yet for “{x.sample.name}”</strong>
          {x.error ? `: ${x.error}` : ' (computing or waiting for valid inputs).'}
        </p>
      ))}
    </div>
  )
}

/** A line sample in a legend or table header: the line's colour and dash, drawn. */
export function Swatch(p: { shown: ShownSample }) {
  return <DashSwatch stroke={p.shown.style.stroke} dash={p.shown.style.dash} />
}

export const withResults = (shown: ShownSample[]) => shown.filter((x): x is ShownSample & { result: NonNullable<ShownSample['result']> } => !!x.result)
