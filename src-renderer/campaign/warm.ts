// A stretch of the station record made into a sample has the record's bins, the campaign sample's composition and
// humidity and the study's wavelengths: every such sample's size integration visits the same nodes. Once a record
// has arrived, the optics workers work out the mean of all its rows (a sample like any stretch's), so that a
// stretch's sample finds its nodes in their caches and gets its first figures as quickly as an edit does.
//
// It waits while the charts are zoomed or panned: the optics workers take both processors for about half a second,
// and the page's redraws then waited for one (a trace of ten zoom steps just after the open: the first two steps'
// page thread busy 80 and 44 ms for 15 and 8 ms of its own processor time; DEVELOPERS.md).
import { stretchSample, type CampaignRecord } from '../../src-core/index.ts'
import { warmNodes } from '../compute/client.ts'
import { store } from '../state/store.ts'

/** The warming starts once the charts have not moved for this long (ms; their first drawing counts as a move): a
 * gesture's settling and its redraws, and the first zoom that comes soon after the charts are drawn. */
export const QUIET_MS = 600

/** When the charts last moved (performance.now()). */
let movedAt = -Infinity

/** The record whose charts were last drawn. */
let drawn: CampaignRecord | null = null

/** Said by the charts at each zoom or pan step. */
export function chartsMoved(): void {
  movedAt = performance.now()
}

/** Said by the charts once they are drawn for a record (a user's first zoom comes soon after). */
export function chartsDrawn(r: CampaignRecord): void {
  drawn = r
  chartsMoved()
}

/** A record whose charts are not drawn this long after its arrival (another view shown) is warmed all the same. */
const UNSEEN_MS = 3000

/** The last record to arrive: a record's warming waiting when a newer one came is dropped. */
let latest: CampaignRecord | null = null

/** The waiting warming's check, and whether a stretch was marked since the record came (see stretchMarked). */
let waiting: (() => void) | null = null
let marked = false

/**
 * Said when a stretch is marked: a sample is likely asked for next, so the warming waits no longer (a sample
 * asked for while it runs replaces it, and finds in the caches the nodes it got through).
 */
export function stretchMarked(): void {
  marked = true
  waiting?.()
}

export function warmStretchNodes(r: CampaignRecord): void {
  latest = r
  marked = false
  waiting = null
  const arrived = performance.now()
  // where the files record a humidity, each stretch's sample takes its own mean of it, and the node caches are kept
  // per humidity: no sample worked out here would share a stretch's nodes
  if (r.rh) return
  // once the charts are drawn and have not moved for QUIET_MS, or at once when a stretch is marked (the mean of a
  // year's rows takes a few tens of milliseconds on the page too)
  let sent = false
  const when = () => {
    if (r !== latest || sent) return
    const now = performance.now()
    if (!marked) {
      if (drawn !== r && now - arrived < UNSEEN_MS) return void setTimeout(when, 100)
      const wait = (drawn === r ? movedAt : arrived) + QUIET_MS - now
      if (wait > 0) return void setTimeout(when, wait)
    }
    sent = true
    waiting = null
    let sample
    try {
      sample = stretchSample(r, -Infinity, Infinity).sample
    } catch {
      return // no row with a distribution: no stretch can be made into a sample either
    }
    warmNodes({ ...store().get().study, samples: [sample] })
  }
  waiting = when
  setTimeout(when, QUIET_MS)
}
