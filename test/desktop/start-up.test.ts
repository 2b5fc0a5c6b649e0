// Start-up: the study named on the command line, the first windows, and quitting when the last window closes.
import { describe, expect, it } from 'vitest'
import { firstWindows, quitsWhenAllWindowsClose, studyArgument } from '../../src-main/start-up.ts'

const copy = (name: string) => ({ file: `/r/${name}.json`, copy: { text: '{}', savedAt: '2025-03-01T12:00:00Z', name } })

describe('studyArgument', () => {
  it('skips the app folder while developing, and the executable only when packaged', () => {
    expect(studyArgument(['electron', '/src/app', '/data/a.mote'], false, '/home/u')).toBe('/data/a.mote')
    expect(studyArgument(['electron', 'x.mote'], false, '/home/u')).toBeUndefined()
    expect(studyArgument(['motebench', '/data/b.mote'], true, '/home/u')).toBe('/data/b.mote')
  })

  it('reads the path relative to the folder the app was started in', () => {
    expect(studyArgument(['motebench', 'studies/c.mote'], true, '/home/u')).toBe('/home/u/studies/c.mote')
  })

  it('takes only study files, whatever the letter case of .mote, and no options', () => {
    expect(studyArgument(['motebench', '--inspect', 'notes.txt', '/d/E.MOTE'], true, '/')).toBe('/d/E.MOTE')
    expect(studyArgument(['motebench', '--log=a.mote'], true, '/')).toBeUndefined()
    expect(studyArgument(['motebench'], true, '/')).toBeUndefined()
  })
})

describe('firstWindows', () => {
  it('opens the demo when there is nothing to recover or open', () => {
    expect(firstWindows([], undefined)).toEqual([{ demo: true }])
  })

  it('offers every recovery copy in a window of its own, and still opens the study named', () => {
    const leftovers = [copy('a'), copy('b')]
    expect(firstWindows(leftovers, '/data/x.mote')).toEqual([{ recover: leftovers[0] }, { recover: leftovers[1] }, { openFile: '/data/x.mote' }])
  })

  it('opens just the study named when nothing was left by a crash', () => {
    expect(firstWindows([], '/data/x.mote')).toEqual([{ openFile: '/data/x.mote' }])
  })
})

describe('quitsWhenAllWindowsClose', () => {
  it('quits on Windows and Linux, stays in the dock on macOS', () => {
    expect(quitsWhenAllWindowsClose('linux')).toBe(true)
    expect(quitsWhenAllWindowsClose('win32')).toBe(true)
    expect(quitsWhenAllWindowsClose('darwin')).toBe(false)
  })
})
