// What the web and the Electron builds of the renderer share (vite.web.config.ts, electron.vite.config.ts).
import { resolve } from 'node:path'
import type { Plugin } from 'vite'

/** The app's optics workers: the computing worker and its helpers (src-renderer/compute). */
const OPTICS_WORKERS = /src-renderer[\\/]compute[\\/](worker|shareWorker)\.ts/

/** In a bundle, src-core's mathjsExpressions.ts taken from mathjsExpressionsOnDemand.ts. */
const onDemand: Plugin = {
  name: 'motebench-expressions-on-demand-alias',
  resolveId(source, importer) {
    if (!importer || !/[\\/]src-core[\\/]/.test(importer) || !source.endsWith('/mathjsExpressions.ts')) return null
    return resolve(import.meta.dirname, 'src-core/mathjsExpressionsOnDemand.ts')
  }
}

/**
 * Builds the optics workers with src-core/mathjsExpressionsOnDemand.ts in place of mathjsExpressions.ts: they then
 * start without mathjs (their script 150 KB instead of 800 KB) and load it only for a study with components given
 * by expressions. Each worker is bundled on its own (at the same time as the others), so the bundles of the optics
 * workers get the alias as a plugin of their own, first in line.
 */
export function expressionsOnDemand(): Plugin {
  return {
    name: 'motebench-expressions-on-demand',
    options(options) {
      if (!OPTICS_WORKERS.test(JSON.stringify(options.input ?? ''))) return null
      return { ...options, plugins: [onDemand, ...[options.plugins ?? []].flat()] }
    }
  }
}
