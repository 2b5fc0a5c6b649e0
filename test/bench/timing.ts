// Timing helpers for `npm run bench`: medians of repeats, each repeat long enough to time well.
import { readFileSync } from 'node:fs'

/** Median of a list of numbers. */
export function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b)
  const m = s.length >> 1
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m])
}

/**
 * Runs `once` (which does `work` evaluations) repeatedly for at least `minMs` per repeat, `repeats` times
 * after a warm-up of at least half a second (so the JIT has settled), and returns the median nanoseconds per
 * evaluation.
 */
export function nsPerEvaluation(once: () => void, work: number, repeats = 7, minMs = 150): number {
  const t0 = performance.now()
  while (performance.now() - t0 < Math.max(minMs, 500)) once()
  const per: number[] = []
  for (let r = 0; r < repeats; r++) {
    let calls = 0
    const start = performance.now()
    let now = start
    do {
      once()
      calls++
      now = performance.now()
    } while (now - start < minMs)
    per.push(((now - start) * 1e6) / (calls * work))
  }
  return median(per)
}

/** Median milliseconds of `repeats` runs of `once`, after one warm-up run. */
export function msPerRun(once: () => void, repeats = 9): number {
  once()
  const per: number[] = []
  for (let r = 0; r < repeats; r++) {
    const start = performance.now()
    once()
    per.push(performance.now() - start)
  }
  return median(per)
}

/**
 * This process's peak resident memory in MB, its worker threads included (they share its memory). On Linux from
 * /proc/self/status (VmHWM): `process.resourceUsage().maxRSS` there also counts what the parent process held when it
 * started this one (a forked copy of it is this process until the exec), so a child of a 300 MB process read at
 * least 300 MB whatever it used itself (a 39 MB child read 309 MB). Elsewhere, maxRSS. (series.bench.ts's child
 * processes read it with the same lines.)
 */
export function peakResidentMb(): number {
  try {
    const m = /VmHWM:\s*(\d+)\s*kB/.exec(readFileSync('/proc/self/status', 'utf8'))
    if (m) return Number(m[1]) / 1024
  } catch {}
  return process.resourceUsage().maxRSS / 1024
}

/** One JSON line per case. */
export function report(caseName: string, figures: Record<string, number | string>): void {
  process.stdout.write(JSON.stringify({ case: caseName, ...figures }) + '\n')
}

/**
 * Variables left out of the environment of the Node processes a case times. NODE_EXTRA_CA_CERTS makes every Node
 * process read and parse the named certificate bundle as it starts: where it named the system's bundle (as on this
 * project's build machines), `node -e 0` took 0.13–0.17 s with it and 0.05–0.06 s without (2026-12-05), which
 * hides the command line's own start in `cli-start`. The command line opens no network connection, so nothing
 * else depends on it; a user's machine does not usually set it.
 */
const LEFT_OUT = ['NODE_EXTRA_CA_CERTS']

/** The environment for a timed Node process: this one's without LEFT_OUT. */
export function timedEnv(): NodeJS.ProcessEnv {
  const env = { ...process.env }
  for (const name of LEFT_OUT) delete env[name]
  return env
}

/** For a case's JSON line: which of LEFT_OUT were set here and left out of the timed processes ({} if none). */
export function envLeftOut(): Record<string, string> {
  const set = LEFT_OUT.filter((name) => process.env[name] !== undefined)
  return set.length ? { env_left_out: set.join(',') } : {}
}
