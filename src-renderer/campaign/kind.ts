// What an instrument file holds, guessed from its beginning: the page's choice when a file is added, and the record
// worker's, which reads the files it measured ahead of the record asked of it (worker.ts).
import { parseSizerText, type CampaignFileKind } from '../../src-core/index.ts'

/**
 * What a file holds, from its header (`text`: the file's beginning is enough): measured coefficients by their
 * column names, sizers by their diameter unit.
 */
export function guessKind(name: string, text: string): CampaignFileKind {
  const head = text.slice(0, 4000).toLowerCase()
  if (/^time\b.*\bscattering \d/m.test(head)) return 'scattering'
  if (/^time\b.*\babsorption \d/m.test(head)) return 'absorption'
  if (/volume-equivalent|merged size distribution/.test(head) || /merged/i.test(name)) return 'merged'
  try {
    return parseSizerText(text.slice(0, 20000).split(/\r?\n/).slice(0, 60).join('\n'), { fileName: name }).diameterUnit === 'um' ? 'aerodynamic' : 'mobility'
  } catch {
    return 'mobility'
  }
}
