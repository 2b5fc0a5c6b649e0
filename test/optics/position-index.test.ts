// PositionIndex (src-core/optics/positionIndex.ts) answers as a Map<number, number> keyed by the same positions
// would: the node tables used a Map before, so the reference here is the Map itself, on lattice positions as the
// size integration makes them (dyadic multiples, few mantissa bits) and on arbitrary doubles.
import { describe, expect, it } from 'vitest'
import { PositionIndex } from '../../src-core/optics/positionIndex.ts'

/** Adds keys[0..n) in order; checks every key and `absent` against a Map with the same keys. */
function agreesWithMap(keys: Float64Array, absent: number[]): void {
  const index = new PositionIndex()
  const map = new Map<number, number>()
  for (let i = 0; i < keys.length; i++) {
    if (map.has(keys[i])) continue
    index.add(i, keys)
    map.set(keys[i], i)
  }
  for (const t of [...keys, ...absent]) expect(index.get(t, keys)).toBe(map.get(t) ?? -1)
}

describe('PositionIndex', () => {
  it('finds lattice positions of many levels, as a Map does, and not the positions between them', () => {
    // t = j·2^-L over [-30, 40), added level by level as the integration adds them: every integer j at level 0, the
    // odd j (the positions new at that level) at levels 1..10; 70·2^10 positions in all
    const keys: number[] = []
    for (let L = 0; L <= 10; L++) for (let j = -30 * 2 ** L + (L === 0 ? 0 : 1); j < 40 * 2 ** L; j += L === 0 ? 1 : 2) keys.push(j * 2 ** -L)
    expect(new Set(keys).size).toBe(70 * 2 ** 10)
    const absent = [0.5 * 2 ** -10, 1e-300, 41, -31, 3 + 2 ** -12]
    agreesWithMap(Float64Array.from(keys), absent)
  })

  it('finds arbitrary doubles (a measured bin starts from its own edge), as a Map does', () => {
    let s = 12345
    const next = () => ((s = (Math.imul(s, 1103515245) + 12345) >>> 0) / 2 ** 32)
    const keys = Float64Array.from({ length: 50_000 }, () => (next() - 0.5) * 10 ** (6 * next() - 3))
    agreesWithMap(keys, [0.123456789, -7.5, 1e9])
  })

  it('takes −0 for 0 (keys equal by ===, as a Map has them)', () => {
    const keys = Float64Array.from([0, 1, -1])
    const index = new PositionIndex()
    for (let i = 0; i < keys.length; i++) index.add(i, keys)
    expect(index.get(-0, keys)).toBe(0)
    expect(index.get(0, keys)).toBe(0)
  })

  it('forgets every key when cleared, and takes new ones after', () => {
    const keys = Float64Array.from({ length: 1000 }, (_, i) => i / 8)
    const index = new PositionIndex()
    for (let i = 0; i < keys.length; i++) index.add(i, keys)
    index.clear()
    for (const t of keys) expect(index.get(t, keys)).toBe(-1)
    const other = Float64Array.from({ length: 300 }, (_, i) => -i / 4)
    for (let i = 0; i < other.length; i++) index.add(i, other)
    for (let i = 0; i < other.length; i++) expect(index.get(other[i], other)).toBe(i)
  })
})
