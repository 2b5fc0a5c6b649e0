/**
 * What each node of the size grid contributes, kept from one computation to the next.
 *
 * A node's cross-sections depend on the particle (indices at the wavelength, mixing, water uptake, humidity)
 * and its position on the grid, not on how many particles there are or how they are distributed. The size
 * grid of a lognormal mode is a fixed dyadic lattice in the integration variable (see integrate.ts), so when
 * an edit changes a mode's number, median or width, most nodes are where they were and only the weights
 * change: their Mie results are taken from here. A context key names everything a node's value depends on
 * except its position; within a context, nodes are keyed by their position t on the lattice.
 *
 * The cache is bounded by a count of nodes; the contexts used longest ago are dropped first.
 */

/** One node, per unit of (quadrature weight × dN/dlnD). */
export interface NodeValue {
  /** ln of the dry diameter (µm), and du/dt at the node. */
  u: number
  dudt: number
  /** Cross-sections (µm²) and C_sca·g. */
  ext: number
  sca: number
  abs: number
  gsca: number
  /** S11 at the upscatter cosines, unweighted (null until a level that accumulates angles needed it). */
  up: Float64Array | null
  /** S11 then S12 at the chosen angles, and which angles (null until needed). */
  user: Float64Array | null
  userKey: string
}

export class NodeCache {
  private contexts = new Map<string, Map<number, NodeValue>>()
  private count = 0

  constructor(readonly limit = 400_000) {}

  /** The nodes of one context (created empty), marked as the most recently used. */
  context(key: string): Map<number, NodeValue> {
    let nodes = this.contexts.get(key)
    if (nodes) {
      this.contexts.delete(key)
    } else {
      nodes = new Map()
    }
    this.contexts.set(key, nodes)
    return nodes
  }

  /**
   * Records `n` nodes added to a context, then drops whole contexts, least recently used first, until the
   * count is back under three quarters of the limit (a context larger than the limit on its own goes too).
   */
  grew(n: number): void {
    this.count += n
    if (this.count <= this.limit) return
    for (const [key, nodes] of this.contexts) {
      if (this.count <= this.limit * 0.75) break
      this.count -= nodes.size
      nodes.clear()
      this.contexts.delete(key)
    }
  }

  get size(): number {
    return this.count
  }

  clear(): void {
    this.contexts.clear()
    this.count = 0
  }
}
