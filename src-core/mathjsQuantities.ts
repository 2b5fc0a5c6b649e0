/**
 * The mathjs instance for units (mathjsOnDemand.ts makes it on first use), with only the functions it needs. In a
 * module of its own so that the command line's build can load mathjs only when a unit other than a metric length
 * is first read (scripts/build-cli.mjs bundles this module apart and loads it on first call; units.ts reads
 * metric lengths and complex indices itself).
 */
import { create, unitDependencies, type MathJsInstance } from 'mathjs'

export function makeQuantities(): MathJsInstance {
  return create({ unitDependencies })
}
