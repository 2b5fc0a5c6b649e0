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
import { PositionIndex } from './positionIndex.ts'

/** Per node, in `NodeTable.values` at NODE_FIELDS·i: these fields, in this order. */
export const NODE_U = 0
/** du/dt at the node. */
export const NODE_DUDT = 1
/** Cross-sections (µm²) per unit of (quadrature weight × dN/dlnD), and C_sca·g. */
export const NODE_EXT = 2
export const NODE_SCA = 3
export const NODE_ABS = 4
export const NODE_GSCA = 5
/** How many scalars each node holds. */
export const NODE_FIELDS = 6

/**
 * The nodes of one context, kept in typed arrays rather than an object per node: a computation adds thousands
 * of nodes, and allocating an object and a typed array for each, with the garbage collection it brought, cost
 * a tenth of a quick pass (the demo's coastal sample in Node 20: 125–127 ms against 112–116 ms now). Node i's
 * scalars are values[NODE_FIELDS·i + NODE_…]; its angular rows (S11 at the upscatter cosines; S11 then S12 at
 * the chosen angles) are stretches of `angular`.
 */
export class NodeTable {
  private readonly index = new PositionIndex()
  private count = 0
  /** Node i's position t, and the node `findNext` found last: a pass over the same lattice meets the nodes in
   * the order they were added, so the next one is usually the one after it (a Map lookup of a double was a
   * quarter of an edit's warm pass). */
  private tAt = new Float64Array(64)
  private lastFound = -1
  values = new Float64Array(NODE_FIELDS * 64)
  /** Where node i's upscatter row and chosen-angle row start in `angular` (−1: not computed). */
  private upAt = new Int32Array(64).fill(-1)
  private userAt = new Int32Array(64).fill(-1)
  /** Which set of chosen angles node i's row is for (an id from `keyIds`). */
  private userKeyOf = new Int32Array(64)
  private readonly keyIds = new Map<string, number>()
  angular = new Float64Array(4096)
  private angularUsed = 0
  /** Integrations using this table now (a stepped one may be paused): a dropped table in use is not reused. */
  users = 0

  get size(): number {
    return this.count
  }

  /** How many nodes the table holds without growing. */
  get capacity(): number {
    return this.upAt.length
  }

  /** Empties the table for another context, keeping its arrays (their size is what the last context needed). */
  reset(): this {
    this.lastFound = -1
    this.index.clear()
    this.keyIds.clear()
    this.count = 0
    this.angularUsed = 0
    return this
  }

  /** The node at lattice position t, or −1. */
  find(t: number): number {
    return this.index.get(t, this.tAt)
  }

  /** find(t) for a pass along the lattice: tries the node after the one it found last first. */
  findNext(t: number): number {
    const g = this.lastFound + 1
    if (g < this.count && this.tAt[g] === t) return (this.lastFound = g)
    const i = this.index.get(t, this.tAt)
    if (i >= 0) this.lastFound = i
    return i
  }

  /** Adds the node at t with its scalars; returns its number. */
  add(t: number, u: number, dudt: number, ext: number, sca: number, abs: number, gsca: number): number {
    const i = this.count++
    if (i === this.upAt.length) this.growNodes()
    const v = this.values
    const at = NODE_FIELDS * i
    v[at + NODE_U] = u
    v[at + NODE_DUDT] = dudt
    v[at + NODE_EXT] = ext
    v[at + NODE_SCA] = sca
    v[at + NODE_ABS] = abs
    v[at + NODE_GSCA] = gsca
    this.tAt[i] = t
    this.lastFound = i
    this.upAt[i] = -1
    this.userAt[i] = -1
    this.index.add(i, this.tAt)
    return i
  }

  /** Where node i's upscatter row starts in `angular`, or −1 when it has none. */
  upRow(i: number): number {
    return this.upAt[i]
  }

  /** A zeroed row of `width` values in `angular` for node i's upscatter sums; returns where it starts. */
  newUpRow(i: number, width: number): number {
    return (this.upAt[i] = this.reserve(width))
  }

  /** Where node i's row for the chosen angles `key` starts in `angular`, or −1 when it has none for them. */
  userRow(i: number, key: string): number {
    return this.userAt[i] >= 0 && this.userKeyOf[i] === this.keyIds.get(key) ? this.userAt[i] : -1
  }

  /** A zeroed row of `width` values for node i's sums at the chosen angles `key`; returns where it starts. */
  newUserRow(i: number, key: string, width: number): number {
    let id = this.keyIds.get(key)
    if (id === undefined) this.keyIds.set(key, (id = this.keyIds.size))
    this.userKeyOf[i] = id
    return (this.userAt[i] = this.reserve(width))
  }

  private growNodes(): void {
    const n = 2 * this.upAt.length
    const values = new Float64Array(NODE_FIELDS * n)
    values.set(this.values)
    this.values = values
    const tAt = new Float64Array(n)
    tAt.set(this.tAt)
    this.tAt = tAt
    const grow = (a: Int32Array, fill: number) => {
      const b = new Int32Array(n).fill(fill)
      b.set(a)
      return b
    }
    this.upAt = grow(this.upAt, -1)
    this.userAt = grow(this.userAt, -1)
    this.userKeyOf = grow(this.userKeyOf, 0)
  }

  private reserve(width: number): number {
    const at = this.angularUsed
    if (at + width > this.angular.length) {
      const bigger = new Float64Array(Math.max(2 * this.angular.length, at + width))
      bigger.set(this.angular.subarray(0, at))
      this.angular = bigger
    }
    // a table handed on from a dropped context holds its old rows here; the angular tables add into a row
    this.angular.fill(0, at, at + width)
    this.angularUsed = at + width
    return at
  }
}

/**
 * The nodes of one context of the integration over many wavelengths at once (spectralIntegrate.ts): per node u,
 * du/dt, then at each wavelength C_ext, C_sca, C_abs and C_sca·g (µm²), in `values` at width·i. `size` counts
 * the table in nodes of NODE_FIELDS numbers, for the cache's bound.
 */
export class SpectralNodeTable {
  private readonly index = new PositionIndex()
  private count = 0
  /** Node i's position t. */
  private tAt = new Float64Array(64)
  readonly width: number
  values: Float64Array
  constructor(readonly wavelengths: number) {
    this.width = 2 + 4 * wavelengths
    this.values = new Float64Array(this.width * 64)
  }

  get nodes(): number {
    return this.count
  }

  get size(): number {
    return this.count * Math.ceil(this.width / NODE_FIELDS)
  }

  /** The node at lattice position t, or −1. */
  find(t: number): number {
    return this.index.get(t, this.tAt)
  }

  /** Adds the node at t (its u and du/dt set, its cross-sections to be written at width·i + 2 + 4j …); returns its number. */
  add(t: number, u: number, dudt: number): number {
    const i = this.count++
    if ((i + 1) * this.width > this.values.length) {
      const bigger = new Float64Array(2 * this.values.length)
      bigger.set(this.values)
      this.values = bigger
    }
    if (i === this.tAt.length) {
      const tAt = new Float64Array(2 * i)
      tAt.set(this.tAt)
      this.tAt = tAt
    }
    this.tAt[i] = t
    this.values[this.width * i] = u
    this.values[this.width * i + 1] = dudt
    this.index.add(i, this.tAt)
    return i
  }
}

export class NodeCache {
  private contexts = new Map<string, NodeTable | SpectralNodeTable>()
  private count = 0
  /**
   * Tables of dropped contexts, emptied and given to the next new context: a run whose contexts are never used
   * twice (each draw of an uncertainty run has its own humidity and indices) would otherwise allocate and grow
   * new arrays for every one, and leave the old to the garbage collector.
   */
  private spare: NodeTable[] = []
  /** Nodes the spare tables hold room for: at most a quarter of the limit. */
  private spareCapacity = 0

  constructor(readonly limit = 400_000) {}

  /** The nodes of one context (created empty), marked as the most recently used. */
  context(key: string): NodeTable {
    let nodes = this.contexts.get(key)
    if (nodes instanceof NodeTable) {
      this.contexts.delete(key)
    } else {
      if (nodes) this.count -= nodes.size
      const spare = this.spare.pop()
      if (spare) this.spareCapacity -= spare.capacity
      nodes = spare?.reset() ?? new NodeTable()
    }
    this.contexts.set(key, nodes)
    return nodes
  }

  /** The nodes of one context of an integration over `wavelengths` wavelengths at once (created empty), marked as the most recently used. */
  spectralContext(key: string, wavelengths: number): SpectralNodeTable {
    let nodes = this.contexts.get(key)
    if (nodes instanceof SpectralNodeTable && nodes.wavelengths === wavelengths) {
      this.contexts.delete(key)
    } else {
      if (nodes) this.count -= nodes.size
      nodes = new SpectralNodeTable(wavelengths)
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
      this.contexts.delete(key)
      if (nodes instanceof NodeTable && nodes.users === 0 && this.spareCapacity + nodes.capacity <= this.limit / 4) {
        this.spare.push(nodes)
        this.spareCapacity += nodes.capacity
      }
    }
  }

  get size(): number {
    return this.count
  }

  /**
   * Drops every context, handing its table (when no integration is using it) to the next new contexts, whatever
   * the spare tables' bound: for a caller whose contexts are never used again (an uncertainty draw with its own
   * humidity or indices), which thus computes draw after draw in the same few tables instead of allocating and
   * growing new ones (contexts dropped by `grew` in batches of a quarter of the limit were mostly not kept).
   */
  recycle(): void {
    for (const nodes of this.contexts.values()) {
      if (nodes instanceof NodeTable && nodes.users === 0) {
        this.spare.push(nodes)
        this.spareCapacity += nodes.capacity
      }
    }
    this.contexts.clear()
    this.count = 0
  }

  clear(): void {
    this.contexts.clear()
    this.spare.length = 0
    this.spareCapacity = 0
    this.count = 0
  }
}
