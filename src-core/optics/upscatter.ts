/**
 * The angular rule of the upscatter integrals: b, β(μ₀) and β̄ of a population from its S11 summed at fixed
 * scattering angles.
 *
 * Nodes. 32 Gauss–Legendre nodes in the scattering angle Θ on each hemisphere ([0, π/2] and its mirror
 * [π/2, π], so that the angular table computes each mirrored pair in one pass), with weights w·sin Θ. In Θ the
 * integrands are analytic where the phase function is: a rule in cos Θ meets the √ singularity of Θ(μ) at
 * μ = ±1 (β̄ from a 32-node rule in cos Θ was off by 5e-5 on a lossless coarse mode), and puts its first node
 * at 2.4° against 0.12° here, inside the forward peak of spheres with x up to a few hundred.
 *
 * With P normalised to ½∫P dμ = 1 and F(μ, μ₀) = arccos(μ₀ μ / (√(1−μ₀²) √(1−μ²)))/π (clamped) the part of
 * the azimuth circle at cos Θ = μ that points upward for sun at cos-zenith μ₀:
 * - b = ½ ∫_{−1}^{0} P dμ (the backward hemisphere);
 * - β(μ₀) = ½ ∫ P F(μ, μ₀) dμ (Wiscombe & Grams 1976, J. Atmos. Sci. 33:2440). F has a √-shaped corner at
 *   Θ = 90° − z₀ and at its mirror (z₀ the sun's zenith angle), where a Gauss rule converges slowly (errors of
 *   up to 8e-3 in β(μ₀) were measured with 32 Gauss cosines per hemisphere): the weights here integrate the
 *   polynomial that interpolates P·sinΘ at each hemisphere's nodes against F exactly (product integration,
 *   the moments of F taken at load time with the corner as a node of a √-graded rule);
 * - β̄ = ∫₀¹ β(μ₀) dμ₀ = ½ ∫ P(μ) Θ(μ)/π dμ = ⟨Θ⟩/π: averaged over a uniform cos-zenith, the chance that light
 *   turned by Θ goes upward is Θ/π (the pair of directions spans an arc of length Θ on a random great circle,
 *   which crosses the horizon with chance Θ/π, upward half the time; checked numerically against the
 *   Legendre series of F in test/optics/upscatter.test.ts). The integrand is smooth in Θ.
 * Where the nodes do not resolve the forward peak of the largest particles, ½Σ w P falls short of 1: the
 * shortfall is forward scattering (Θ ≈ 0, where F = 0 and Θ/π = 0) and is counted there.
 */
import { gaussLegendre, gaussLegendreOn } from '../numeric/index.ts'

/** Cos-zenith nodes where β(μ₀) is reported (Gauss–Legendre on [0, 1], 16 nodes), and their weights. */
export const UPSCATTER_NODES = gaussLegendreOn(16, 0, 1)
export const UPSCATTER_COS_ZENITH: readonly number[] = Array.from(UPSCATTER_NODES.nodes)

const HALF = 32
const half = gaussLegendreOn(HALF, 0, Math.PI / 2)
/** Node j: Θ in the forward hemisphere for j < HALF, its mirror π − Θ at j + HALF. */
const theta = new Float64Array(2 * HALF)
for (let j = 0; j < HALF; j++) {
  theta[j] = half.nodes[j]
  theta[j + HALF] = Math.PI - half.nodes[j]
}
const upMu = Float64Array.from(theta, Math.cos)
const upW = Float64Array.from(theta, (t, j) => half.weights[j % HALF] * Math.sin(t))
/** The scattering-angle cosines and weights (∫ f dμ ≈ Σ w f(μ_j)) of the upscatter integrals (read-only). */
export const UPSCATTER_SCATTERING_COSINES: { readonly nodes: Float64Array; readonly weights: Float64Array } = { nodes: upMu, weights: upW }

/** Fraction of the azimuth circle at scattering cosine μ that points upward, for sun at cos-zenith μ₀. */
export function upwardFraction(mu: number, mu0: number, s0 = Math.sqrt(1 - mu0 * mu0)): number {
  const s = Math.sqrt(Math.max(0, 1 - mu * mu))
  const num = mu0 * mu
  const den = s0 * s
  if (den === 0) return num < 0 ? 1 : 0
  const c = num / den
  return c >= 1 ? 0 : c <= -1 ? 1 : Math.acos(c) / Math.PI
}

/**
 * Product-integration weights, row i for μ₀_i: Σ_j K[i][j] f(Θ_j) = ∫ ℓf(Θ) F(cos Θ, μ₀_i) sin Θ dΘ, with ℓf the
 * polynomial interpolating f on each hemisphere's nodes. Written as Σ_j w_j f_j Σ_l (l+½) P_l(t_j) m_l, with
 * t the node's position on [−1, 1] and m_l = ∫ P_l(t) F sinΘ dΘ (Gauss nodes are orthogonal for the
 * Lagrange basis: ℓ_j(t) = w_j Σ_{l<n} (l+½) P_l(t_j) P_l(t) for the rule's unit weights w_j). Made on first
 * use (some 0.025 s of a thread's start at a load; the command line's reading thread never needs it).
 */
let kernelTable: Float64Array | undefined
const upscatterKernel = (): Float64Array => (kernelTable ??= makeKernel())

function makeKernel(): Float64Array {
  const unit = gaussLegendre(HALF)
  const graded = gaussLegendre(64)
  const k = new Float64Array(UPSCATTER_COS_ZENITH.length * 2 * HALF)
  const pl = new Float64Array(HALF)
  const legendre = (t: number) => {
    pl[0] = 1
    pl[1] = t
    for (let l = 2; l < HALF; l++) pl[l] = ((2 * l - 1) * t * pl[l - 1] - (l - 1) * pl[l - 2]) / l
  }
  const m = new Float64Array(HALF)
  UPSCATTER_COS_ZENITH.forEach((mu0, i) => {
    const s0 = Math.sqrt(1 - mu0 * mu0)
    for (let hemi = 0; hemi < 2; hemi++) {
      // Θ(t) on this hemisphere; the corner of F at Θ = asin(μ₀) (forward) or π − asin(μ₀) (backward)
      const a = hemi === 0 ? 0 : Math.PI / 2
      const thetaOf = (t: number) => (hemi === 0 ? (Math.PI / 4) * (t + 1) : Math.PI - (Math.PI / 4) * (t + 1))
      const corner = hemi === 0 ? Math.asin(mu0) : Math.PI - Math.asin(mu0)
      const tc = Math.min(1, Math.max(-1, hemi === 0 ? (corner - a) / (Math.PI / 4) - 1 : (Math.PI - corner) / (Math.PI / 4) - 1))
      m.fill(0)
      // [−1, tc] and [tc, 1], each with t = tc ∓ d·v² so that the √ corner becomes smooth in v
      for (const [d, sign] of [[tc + 1, -1], [1 - tc, 1]] as const) {
        if (d <= 0) continue
        for (let q = 0; q < graded.nodes.length; q++) {
          const v = 0.5 * (graded.nodes[q] + 1)
          const t = tc + sign * d * v * v
          const th = thetaOf(t)
          const wq = 0.5 * graded.weights[q] * 2 * d * v * (Math.PI / 4)
          const f = upwardFraction(Math.cos(th), mu0, s0) * Math.sin(th)
          if (f === 0) continue
          legendre(t)
          for (let l = 0; l < HALF; l++) m[l] += wq * f * pl[l]
        }
      }
      for (let j = 0; j < HALF; j++) {
        legendre(unit.nodes[j])
        let s = 0
        for (let l = 0; l < HALF; l++) s += (l + 0.5) * pl[l] * m[l]
        // half.nodes[j] = π/4 (unit.nodes[j] + 1): the forward node j sits at t = unit.nodes[j], as does its mirror
        k[i * 2 * HALF + hemi * HALF + j] = unit.weights[j] * s
      }
    }
  })
  return k
}

const upScratch = new Float64Array(UPSCATTER_COS_ZENITH.length)

/**
 * β(μ₀) (into `out`), b and β̄ from Σ weight·S11 at UPSCATTER_SCATTERING_COSINES (`acc`) and the σsca of the same
 * nodes (µm², per the weights), at wavelength² lambda2 (µm²).
 */
export function upscatterFrom(acc: Float64Array, sca: number, lambda2: number, out: Float64Array = upScratch): { b: number; mean: number; beta: Float64Array } {
  if (!(sca > 0)) {
    out.fill(0)
    return { b: 0, mean: 0, beta: out }
  }
  // P(μ) = (λ²/π) acc / σsca; ½∫P dμ should be 1: if the rule overshoots it, renormalise; if it falls
  // short, the shortfall is forward scattering (F = 0, Θ = 0).
  let norm = 0
  let back = 0
  let turned = 0
  for (let j = 0; j < acc.length; j++) {
    const v = upW[j] * acc[j]
    norm += v
    if (j >= HALF) back += v
    turned += v * theta[j]
  }
  const scale = Math.max((lambda2 / Math.PI / sca) * 0.5, 0)
  const z = norm * scale
  const s = z > 1 ? scale / z : scale
  const n = acc.length
  const kernel = upscatterKernel()
  for (let i = 0; i < UPSCATTER_COS_ZENITH.length; i++) {
    let v = 0
    const row = i * n
    for (let j = 0; j < n; j++) v += kernel[row + j] * acc[j]
    out[i] = Math.min(1, Math.max(0, v * s))
  }
  return { b: back * s, mean: (turned * s) / Math.PI, beta: out }
}

/**
 * The angular sums' control variate: moves b, β(μ₀) and β̄ taken on the nodes of the angular sums (whose own g is
 * `gRows`) to the population's g (`g`, integrated on every node of the size integration).
 *
 * F's Legendre series (Wiscombe & Grams 1976; see test/optics/upscatter.test.ts) begins ½ − ¾ μ μ₀ P₁, so
 * β(μ₀) = ½ − ¾ μ₀ g + R(μ₀), b = β(1) and β̄ = ½ − ⅜ g + R̄, where R holds the higher odd Legendre moments of the
 * phase function. Over a size distribution most of the fine structure of b, β and β̄ (resonances, interference)
 * is in the g term, which the size integration follows to the tolerance; R is much smoother in size. So the
 * angular sums, which stop at a coarser level, supply R and the g term is taken from the finer integration:
 * β(μ₀) += ¾ μ₀ (gRows − g), b += ¾ (gRows − g), β̄ += ⅜ (gRows − g). Where the angular sums used every node,
 * gRows = g and nothing moves. (Where it helps and where it does not: DEVELOPERS.md.)
 */
export function shiftToAsymmetry(up: { b: number; mean: number; beta: Float64Array }, gRows: number, g: number): void {
  const d = gRows - g
  if (!(Math.abs(d) > 0)) return
  const clamp = (v: number) => Math.min(1, Math.max(0, v))
  up.b = clamp(up.b + 0.75 * d)
  up.mean = clamp(up.mean + 0.375 * d)
  for (let i = 0; i < up.beta.length; i++) up.beta[i] = clamp(up.beta[i] + 0.75 * UPSCATTER_COS_ZENITH[i] * d)
}
