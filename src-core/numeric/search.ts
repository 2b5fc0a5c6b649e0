/**
 * The last index i < count with sorted[i] ≤ x, or −1 when there is none (count 0, or x below sorted[0]); by
 * binary search. Domain: sorted[0 .. count) non-decreasing; count ≤ sorted.length (default: all of it). Used for
 * the time step or the size bin that holds a value.
 */
export function lastAtOrBelow(sorted: ArrayLike<number>, x: number, count = sorted.length): number {
  if (count <= 0 || !(x >= sorted[0])) return -1
  let lo = 0
  let hi = count - 1
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1
    if (sorted[mid] <= x) lo = mid
    else hi = mid - 1
  }
  return lo
}
