// Which windows open at start-up, and when the app quits: decisions taken before and after any window exists.
import { resolve } from 'node:path'
import type { RecoveryCopy } from './host-api.ts'

/** The study file named on the command line (or by the desktop's file association), as an absolute path. */
export function studyArgument(argv: readonly string[], packaged: boolean, cwd: string): string | undefined {
  // argv: the executable, then (when not packaged) the app's folder or script, then the user's arguments.
  const named = argv.slice(packaged ? 1 : 2).find((a) => !a.startsWith('-') && /\.mote$/i.test(a))
  return named === undefined ? undefined : resolve(cwd, named)
}

export type FirstWindow<Leftover> = { recover: Leftover } | { openFile: string } | { demo: true }

/**
 * The first windows: one per recovery copy left by a crash (each offers its copy), one for a study named on the
 * command line, and the demo only when there is neither.
 */
export function firstWindows<Leftover extends { copy: RecoveryCopy }>(leftovers: readonly Leftover[], studyPath: string | undefined): FirstWindow<Leftover>[] {
  const windows: FirstWindow<Leftover>[] = leftovers.map((recover) => ({ recover }))
  if (studyPath) windows.push({ openFile: studyPath })
  return windows.length ? windows : [{ demo: true }]
}

/** macOS apps stay running with no window open (the dock icon opens a new one); elsewhere the app quits. */
export function quitsWhenAllWindowsClose(platform: NodeJS.Platform): boolean {
  return platform !== 'darwin'
}
