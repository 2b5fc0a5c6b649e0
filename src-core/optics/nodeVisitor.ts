/**
 * The nodes of the size integration (integrate.ts): each node's value from the node cache or a Mie evaluation, added
 * to a level's sums with its upscatter row, or with its neighbours' rows where it carries little (the rules are in
 * integrate.ts's module comment). The level loop (integrate.ts) decides which nodes to visit and when to stop; this
 * module visits them.
 */
import { coatedSphereEfficiencies, sphereEfficiencies, type AngularTable, type SphereEfficiencies } from '../mie/index.ts'
import { NODE_ABS, NODE_DUDT, NODE_EXT, NODE_FIELDS, NODE_GSCA, NODE_SCA, NODE_U, type NodeTable } from './nodeCache.ts'
import { UPSCATTER_SCATTERING_COSINES } from './upscatter.ts'
import type { Sums } from './levelSums.ts'
import { particleGrowthAt, particleGrowthSetting, wetParticle, type DryIndices, type ParticleKind, type WetParticle } from './particles.ts'
import type { SizeAxis } from './sizeLattice.ts'
import type { Conditions, SizeSegment } from './integrate.ts'
import type { OpticsWorkspace } from './workspace.ts'

/** Refinement levels of the angular sums on every node that carries scattering; beyond them, see addNode. */
const FIRST_ANGULAR_LEVELS = 2
/**
 * Below this size parameter (at the widest growth) a sphere's phase function changes little over a step of the
 * second level (0.31 in x at x = 5), so the nodes of later levels take their neighbours' rows (see addNode).
 */
const SMOOTH_X = 5
/** Work of a node's angular row, in series terms of its Mie evaluation (see STEP_WORK in integrate.ts). */
const ANGULAR_WORK = 3
const upMu = UPSCATTER_SCATTERING_COSINES.nodes

/** A stretch of the size distribution on the lattice: t0, t1 its ends in t, u the last node's ln D. */
export interface Segment {
  s: SizeSegment
  t0: number
  t1: number
  u: number
}

/** Visits the nodes of one population at one wavelength: evaluates or finds each, and adds it into a level's sums. */
export class NodeVisitor {
  /** Nodes added to the cache (Mie evaluations kept). */
  added = 0
  /** Work since the last pause (see STEP_WORK in integrate.ts). */
  work = 0
  /** The refinement level being visited. */
  lv = 0
  /** Nodes whose largest extinction is below this are left out; nodes scattering less than negligibleSca are left out of the angular sums. */
  negligibleExt = 0
  negligibleSca = 0
  /** Beyond the first angular levels, a node scattering less than this takes its neighbours' rows. */
  interpShare = 0
  /** The integrand (dN/dt·C: σext, σsca, σabs, g·σsca) at the last node addNode visited (0 where it left it out). */
  readonly nodeF = new Float64Array(4)
  /** The efficiencies of the last evaluation. */
  private eff: SphereEfficiencies | null = null
  private growth: ReturnType<typeof particleGrowthSetting> | undefined // at the first evaluation, which throws where it is bad
  private readonly wet: WetParticle = { n: 1, k: 0, coreRatio: 0, coreN: 1, coreK: 0 }
  // A neighbour's row share waiting for the next node (see addNode): node, its t, the share and the sums it goes to.
  private carryNode = -1
  private carryT = NaN
  private carryShare = 0
  private carrySums: Sums | null = null

  constructor(
    private readonly kind: ParticleKind,
    private readonly dry: DryIndices,
    private readonly cond: Conditions,
    private readonly wavelengthUm: number,
    private readonly gMax: number,
    private readonly axis: SizeAxis,
    private readonly nodes: NodeTable,
    private readonly ws: OpticsWorkspace,
    private readonly userTable: AngularTable | null,
    private readonly userKey: string,
    private readonly nUser: number
  ) {}

  /**
   * The Mie evaluation of the particle at dry ln-diameter u: its efficiencies go to `eff`, its coefficients
   * stay in ws.mie; returns its geometric cross-section (µm²).
   */
  private evaluate(u: number): number {
    const kind = this.kind
    const cond = this.cond
    const wet = this.wet
    const ws = this.ws
    const d = Math.exp(u)
    if (this.growth === undefined) this.growth = particleGrowthSetting(kind, cond.rhPercent, cond.history, cond.temperatureK)
    const gf = particleGrowthAt(this.growth, d)
    wetParticle(kind, this.dry, gf, wet)
    const dw = d * gf
    const x = (Math.PI * dw) / this.wavelengthUm
    if (wet.coreRatio > 0) {
      this.eff = coatedSphereEfficiencies(x * wet.coreRatio, wet.coreN, wet.coreK, x, wet.n, wet.k, ws.mie)
    } else {
      this.eff = sphereEfficiencies(x, wet.n, wet.k, ws.mie)
    }
    ws.evaluations++
    return 0.25 * Math.PI * dw * dw
  }

  /** Evaluates the particle at u and keeps it as the node at t; returns its number (ws.mie holds its coefficients). */
  private addEvaluated(t: number, u: number, dudt: number): number {
    const area = this.evaluate(u)
    const e = this.eff!
    this.added++
    this.work += e.terms
    return this.nodes.add(t, u, dudt, e.qext * area, e.qsca * area, e.qabs * area, e.qsca * area * e.g)
  }

  /**
   * The node at lattice position tN of segment seg, with its upscatter row (each evaluated and kept where the
   * cache lacks it): its number, or −1 where the segment holds no scattering particles there. Leaves ws.mie
   * holding another sphere's coefficients.
   */
  private nodeWithRow(seg: Segment, tN: number): number {
    const nodes = this.nodes
    const axis = this.axis
    const ws = this.ws
    if (tN < seg.t0 || tN > seg.t1) return -1
    let i = nodes.find(tN)
    let fresh = false
    if (i < 0) {
      const u = axis.uAt(seg, tN)
      if (!(seg.s.density(u) > 0)) return -1
      i = this.addEvaluated(tN, u, axis.dudt(u))
      fresh = true
    }
    if (!(nodes.values[NODE_FIELDS * i + NODE_SCA] > 0)) return -1
    if (nodes.upRow(i) < 0) {
      if (!fresh) this.evaluate(nodes.values[NODE_FIELDS * i + NODE_U])
      this.work += ANGULAR_WORK * this.eff!.terms
      ws.upTable.accumulate(ws.mie, 1, nodes.angular, null, nodes.newUpRow(i, upMu.length))
    }
    return i
  }

  /** Adds share·(node i's upscatter row) into sums. */
  private addRowTimes(sums: Sums, i: number, share: number): void {
    const nodes = this.nodes
    const rows = nodes.angular
    const r = nodes.upRow(i)
    const up = sums.up
    for (let j = 0; j < up.length; j++) up[j] += share * rows[r + j]
  }

  /** Adds the row share still waiting for the next node (call at the end of a level). */
  flushCarry(): void {
    if (this.carryNode < 0) return
    this.addRowTimes(this.carrySums!, this.carryNode, this.carryShare)
    this.carryNode = -1
  }

  /**
   * The angular sums of a node whose cross-sections were interpolated (a settled panel's, integrate.ts), carrying
   * wsca of σsca: its neighbours' normalised rows and g, as a node carrying little takes them (addNode). False where
   * a neighbour holds no scattering particles (nothing added).
   */
  addNeighbourRows(seg: Segment, base: number, m: number, h: number, wsca: number, sums: Sums): boolean {
    // the segment's last u follows this node, as in addNode, so that a neighbour evaluated here gets the u (to the
    // last bit) it gets in a warm workspace
    const i = this.nodes.findNext(base + m * h)
    seg.u = i >= 0 ? this.nodes.values[NODE_FIELDS * i + NODE_U] : this.axis.uAt(seg, base + m * h)
    if (!(wsca >= this.negligibleSca)) return true
    if (this.carryNode >= 0 && this.carryT !== base + (m - 1) * h) this.flushCarry()
    return this.takeNeighbourRows(seg, base, m, h, wsca, sums)
  }

  /**
   * Adds, for the node at base + m·h carrying wsca of σsca, the mean of its two neighbours' normalised rows and g
   * (the previous level's nodes: base + (m ± 1)·h is how that level wrote them, to the bit), each evaluated and kept
   * where the cache lacks it. False, adding nothing, where a neighbour holds no scattering particles.
   */
  private takeNeighbourRows(seg: Segment, base: number, m: number, h: number, wsca: number, sums: Sums): boolean {
    const tA = base + (m - 1) * h
    // the left neighbour is the last node's right one when that node took its neighbours' rows too
    const a = this.carryNode >= 0 && this.carryT === tA ? this.carryNode : this.nodeWithRow(seg, tA)
    const tB = base + (m + 1) * h
    const b = a >= 0 ? this.nodeWithRow(seg, tB) : -1
    if (a < 0 || b < 0) return false
    const vals = this.nodes.values
    const fa = (0.5 * wsca) / vals[NODE_FIELDS * a + NODE_SCA]
    const fb = (0.5 * wsca) / vals[NODE_FIELDS * b + NODE_SCA]
    // A's row is added once with both shares it takes (this node's and the last one's); B's share waits for the
    // next node, which may take B as its own left neighbour.
    if (this.carryNode === a && this.carrySums === sums) {
      this.addRowTimes(sums, a, fa + this.carryShare)
      this.carryNode = -1
    } else {
      this.flushCarry()
      this.addRowTimes(sums, a, fa)
    }
    this.carryNode = b
    this.carryT = tB
    this.carryShare = fb
    this.carrySums = sums
    sums.angSca += wsca
    sums.angG += fa * vals[NODE_FIELDS * a + NODE_GSCA] + fb * vals[NODE_FIELDS * b + NODE_GSCA]
    return true
  }

  // Adds f(t)·weight for the node at t = base + m·h: from the cache where it holds the node, else from a Mie
  // evaluation.
  addNode(seg: Segment, base: number, m: number, h: number, weight: number, sums: Sums, withUp: boolean, withUser: boolean): void {
    const nodes = this.nodes
    const axis = this.axis
    const ws = this.ws
    const nodeF = this.nodeF
    const userTable = this.userTable
    const nUser = this.nUser
    const t = base + m * h
    nodeF[0] = nodeF[1] = nodeF[2] = nodeF[3] = 0
    if (this.carryNode >= 0 && this.carryT !== base + (m - 1) * h) this.flushCarry()
    let i = nodes.findNext(t)
    const u = i >= 0 ? nodes.values[NODE_FIELDS * i + NODE_U] : axis.uAt(seg, t)
    seg.u = u
    const dens = seg.s.density(u)
    if (!(dens > 0)) return
    const dudt = i >= 0 ? nodes.values[NODE_FIELDS * i + NODE_DUDT] : axis.dudt(u)
    const w = weight * dens * dudt
    // A node whose largest possible extinction (Q_ext < 6 at the widest growth) is below 1e-10 of the
    // previous level's total cannot matter: leave it out (whether or not its value is known, so that the
    // result does not depend on what was computed before).
    const dMax = Math.exp(u) * this.gMax
    if (w * 1.5 * Math.PI * dMax * dMax < this.negligibleExt) return
    let fresh = false
    if (i < 0) {
      i = this.addEvaluated(t, u, dudt)
      fresh = true
    }
    const v = nodes.values
    const at = NODE_FIELDS * i
    const sca = v[at + NODE_SCA]
    const f = dens * dudt
    nodeF[0] = f * v[at + NODE_EXT]
    nodeF[1] = f * sca
    nodeF[2] = f * v[at + NODE_ABS]
    nodeF[3] = f * v[at + NODE_GSCA]
    sums.ext += w * v[at + NODE_EXT]
    sums.sca += w * sca
    sums.abs += w * v[at + NODE_ABS]
    sums.gsca += w * v[at + NODE_GSCA]
    // The angular sums need only the nodes that carry scattering: below 1e-8 of the previous level's
    // σsca a node is left out of them (and out of the σsca they are divided by).
    const user = withUser && userTable !== null
    if ((!withUp && !user) || w * sca < this.negligibleSca) return
    let upRow = withUp ? nodes.upRow(i) : -1
    let userRow = user ? nodes.userRow(i, this.userKey) : -1
    // Beyond the first angular levels a node carrying less than the tolerance's share of σsca takes the mean of
    // its two neighbours' normalised rows and g, whatever the cache holds for it (module comment); the control
    // variate puts its own g back.
    if (withUp && !user && this.lv > FIRST_ANGULAR_LEVELS && (w * sca < this.interpShare || axis.ax * Math.exp(u) < SMOOTH_X)) {
      const before = ws.evaluations
      const took = this.takeNeighbourRows(seg, base, m, h, w * sca, sums)
      if (ws.evaluations !== before) fresh = false
      if (took) return
    }
    this.flushCarry()
    if ((withUp && upRow < 0) || (user && userRow < 0)) {
      if (!fresh) this.evaluate(u)
      this.work += ANGULAR_WORK * this.eff!.terms
      if (withUp && upRow < 0) {
        upRow = nodes.newUpRow(i, upMu.length)
        ws.upTable.accumulate(ws.mie, 1, nodes.angular, null, upRow)
      }
      if (user && userRow < 0) {
        userRow = nodes.newUserRow(i, this.userKey, 2 * nUser)
        userTable.accumulate(ws.mie, 1, nodes.angular, nodes.angular, userRow, userRow + nUser)
      }
    }
    const rows = nodes.angular
    if (withUp) {
      sums.angSca += w * sca
      sums.angG += w * v[at + NODE_GSCA]
      const up = sums.up
      for (let j = 0; j < up.length; j++) up[j] += w * rows[upRow + j]
    }
    if (user) {
      sums.userSca += w * sca
      const s11 = sums.user11!
      const s12 = sums.user12!
      for (let j = 0; j < nUser; j++) {
        s11[j] += w * rows[userRow + j]
        s12[j] += w * rows[userRow + nUser + j]
      }
    }
  }
}
