/**
 * An index from a node's position t (a finite double) to its number, for the node tables (nodeCache.ts).
 *
 * It answers as a `Map<number, number>` would (keys equal by `===`, so −0 finds 0), without allocating per key:
 * a Map boxes each non-integer key as a heap number and rehashes as it grows (30,000 adds and finds of lattice
 * positions took 8–10 ms with a Map against 1.4 ms here, in Node; a humidity edit adds every node anew).
 * Open addressing with linear probing (Knuth 1998, The Art of Computer Programming vol. 3, §6.4, Algorithm L) over
 * an Int32Array of slots, each 0 or a node's number + 1; the keys themselves are the table's own positions (`keys`, owned by the caller), so the
 * index stores no copy of them. Nodes are never removed, only all at once (`clear`).
 */
export class PositionIndex {
  private slots = new Int32Array(128)
  private mask = 127
  private used = 0

  /** Forgets every key, keeping its room. */
  clear(): void {
    this.slots.fill(0)
    this.used = 0
  }

  /** The number stored for t (whose position is keys[number]), or −1. */
  get(t: number, keys: Float64Array): number {
    const slots = this.slots
    const mask = this.mask
    for (let s = hash(t) & mask; ; s = (s + 1) & mask) {
      const v = slots[s]
      if (v === 0) return -1
      if (keys[v - 1] === t) return v - 1
    }
  }

  /** Stores node number i for t = keys[i] (t not yet in the index). */
  add(i: number, keys: Float64Array): void {
    if (2 * (this.used + 1) > this.slots.length) this.grow(keys)
    this.put(i, keys[i])
    this.used++
  }

  private put(i: number, t: number): void {
    const slots = this.slots
    const mask = this.mask
    let s = hash(t) & mask
    while (slots[s] !== 0) s = (s + 1) & mask
    slots[s] = i + 1
  }

  /** Twice the slots, every key placed again (kept at most half full, so a probe meets an empty slot soon). */
  private grow(keys: Float64Array): void {
    const old = this.slots
    this.slots = new Int32Array(2 * old.length)
    this.mask = this.slots.length - 1
    for (let s = 0; s < old.length; s++) if (old[s] !== 0) this.put(old[s] - 1, keys[old[s] - 1])
  }
}

const bits = new Float64Array(1)
const words = new Uint32Array(bits.buffer)

/**
 * A 32-bit hash of a double's bits (0 and −0 alike). A lattice position has few mantissa bits set, often none in
 * the low word, so the words are combined and then mixed by the finaliser of MurmurHash3 (Appleby 2011, fmix32),
 * whose every output bit depends on every input bit.
 */
function hash(t: number): number {
  bits[0] = t === 0 ? 0 : t
  let h = words[0] ^ Math.imul(words[1], 0x9e3779b1)
  h ^= h >>> 16
  h = Math.imul(h, 0x85ebca6b)
  h ^= h >>> 13
  h = Math.imul(h, 0xc2b2ae35)
  return h ^ (h >>> 16)
}
