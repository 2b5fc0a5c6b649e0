/** The workspace of the size integration (integrate.ts), shared by all integrations of a computation. */
import { AngularTable, CoatedWorkspace } from '../mie/index.ts'
import { NodeCache } from './nodeCache.ts'
import { PanelBuffers } from './panels.ts'
import { UPSCATTER_SCATTERING_COSINES } from './upscatter.ts'

const upMu = UPSCATTER_SCATTERING_COSINES.nodes

/** Workspace shared by all integrations of a computation: Mie buffers, angular tables and the node cache. */
export class OpticsWorkspace {
  mie = new CoatedWorkspace()
  upTable = new AngularTable(upMu)
  userTables = new Map<string, AngularTable>()
  /** Every node's cross-sections, kept for the next computation with the same particles (see nodeCache.ts). */
  nodes: NodeCache
  evaluations = 0
  /** Node-value arrays of the refinement by panels, reused from one integration to the next. */
  panelBuffers = new PanelBuffers()
  constructor(nodeLimit?: number) {
    this.nodes = new NodeCache(nodeLimit)
  }
  userTable(anglesDeg: ArrayLike<number>): AngularTable {
    const key = Array.from(anglesDeg).join(',')
    let t = this.userTables.get(key)
    if (!t) {
      t = new AngularTable(Array.from(anglesDeg, (a) => Math.cos((a * Math.PI) / 180)))
      this.userTables.set(key, t)
    }
    return t
  }
}
