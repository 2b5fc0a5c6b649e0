// The cautions: health hazards of handling aerosols and the limits of the forcing estimate.
import { ESTIMATE_CAUTION, FIRST_START_KEY, HEALTH_CAUTIONS } from '../cautions.ts'
import { store } from '../state/store.ts'
import { Dialog } from './Dialog.tsx'

export function CautionText() {
  return (
    <div class="caution-text">
      <h3>Health and safety when sampling and handling aerosols</h3>
      <ul>
        {HEALTH_CAUTIONS.map((c, k) => (
          <li key={k}>{c}</li>
        ))}
      </ul>
      <h3>What the forcing figure is</h3>
      <p>{ESTIMATE_CAUTION}</p>
    </div>
  )
}

export function CautionsDialog() {
  const close = () => {
    try {
      localStorage.setItem(FIRST_START_KEY, '1')
    } catch {
      /* shown again next time */
    }
    store().set({ cautionsOpen: false })
  }
  return (
    <Dialog title="Cautions" name="cautions" onClose={close} wide>
      <CautionText />
      <div class="dialog-buttons">
        <button type="button" class="primary" onClick={close} autofocus data-testid="cautions-ok">
          I have read this
        </button>
      </div>
    </Dialog>
  )
}
