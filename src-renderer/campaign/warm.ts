// A stretch of the station record made into a sample has the record's bins, the campaign sample's composition and
// humidity and the study's wavelengths: every such sample's size integration visits the same nodes. Once a record
// has arrived, the optics workers work out the mean of all its rows (a sample like any stretch's), so that a
// stretch's sample finds its nodes in their caches and gets its first figures as quickly as an edit does.
import { stretchSample, type CampaignRecord } from '../../src-core/index.ts'
import { warmNodes } from '../compute/client.ts'
import { store } from '../state/store.ts'

export function warmStretchNodes(r: CampaignRecord): void {
  // where the files record a humidity, each stretch's sample takes its own mean of it, and the node caches are kept
  // per humidity: no sample worked out here would share a stretch's nodes
  if (r.rh) return
  // after the charts are drawn: the mean of a year's rows takes a few tens of milliseconds on the page
  setTimeout(() => {
    let sample
    try {
      sample = stretchSample(r, -Infinity, Infinity).sample
    } catch {
      return // no row with a distribution: no stretch can be made into a sample either
    }
    warmNodes({ ...store().get().study, samples: [sample] })
  }, 200)
}
