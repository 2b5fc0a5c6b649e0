// The offer of unsaved work found at start-up: when it was saved, what it holds, restore or discard.
import { useEffect, useState } from 'preact/hooks'
import { isoDateTime } from '../format.ts'
import { discardRecovery, onRecoveryOffer, recoveryOffer, restoreRecovery } from '../recovery.ts'

/** "3 minutes ago", "2 hours ago", "4 days ago" (whole units, rounded down). */
export function ago(ms: number): string {
  const min = Math.floor(ms / 60_000)
  const [n, unit] = min < 1 ? [0, ''] : min < 60 ? [min, 'minute'] : min < 48 * 60 ? [Math.floor(min / 60), 'hour'] : [Math.floor(min / 1440), 'day']
  return n === 0 ? 'less than a minute ago' : `${n} ${unit}${n === 1 ? '' : 's'} ago`
}

export function RecoveryOfferBanner() {
  const [, setTick] = useState(0)
  useEffect(() => onRecoveryOffer(() => setTick((t) => t + 1)), [])
  const o = recoveryOffer()
  if (!o) return null
  const saved = new Date(o.copy.savedAt)
  const when = Number.isNaN(saved.getTime()) ? 'an unknown time' : `${isoDateTime(saved)} (${ago(Date.now() - saved.getTime())})`
  const n = o.study.samples.length
  return (
    <section class="recovery-offer" role="region" aria-labelledby="recovery-title" data-testid="recovery-offer">
      <div>
        <strong id="recovery-title">Unsaved work was found</strong>
        <p>
          “{o.copy.name}” ({n} sample{n === 1 ? '' : 's'}{o.copy.path ? `, last saved as ${o.copy.path.split(/[\\/]/).pop()}` : ', never saved'}), copied{' '}
          <span data-testid="recovery-when">{when}</span> before the app was closed or reloaded without saving.
        </p>
      </div>
      <div class="recovery-buttons">
        <button type="button" class="primary" onClick={restoreRecovery} data-testid="recovery-restore">
          Restore it
        </button>
        <button type="button" onClick={() => window.confirm('Discard the unsaved work for good?') && discardRecovery()} data-testid="recovery-discard">
          Discard it
        </button>
      </div>
    </section>
  )
}
