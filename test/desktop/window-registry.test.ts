// The windows' state: what they opened, what they report, and where they may save without asking.
import { describe, expect, it } from 'vitest'
import { WindowRegistry } from '../../src-main/window-registry.ts'

const file = { name: 'a.mote', path: '/data/a.mote', text: '{}' }

describe('WindowRegistry', () => {
  it('lets a window save to the file it opened without a dialog', () => {
    const windows = new WindowRegistry()
    windows.add(1, { file }, '/r/1.json')
    expect(windows.savePathWithoutAsking(1, { path: '/data/a.mote', saveAs: false })).toBe('/data/a.mote')
  })

  it('asks where to save for any path the window was not given, whatever the page sends', () => {
    const windows = new WindowRegistry()
    windows.add(1, { file }, '/r/1.json')
    expect(windows.savePathWithoutAsking(1, { path: '/home/user/.bashrc', saveAs: false })).toBeNull()
    expect(windows.savePathWithoutAsking(1, { path: '/data/b.mote', saveAs: false })).toBeNull()
  })

  it('asks for Save as, and for a study never saved', () => {
    const windows = new WindowRegistry()
    windows.add(1, { file }, '/r/1.json')
    windows.add(2, {}, '/r/2.json')
    expect(windows.savePathWithoutAsking(1, { path: '/data/a.mote', saveAs: true })).toBeNull()
    expect(windows.savePathWithoutAsking(2, { saveAs: false })).toBeNull()
  })

  it('does not trust the path of a recovery copy until the user confirms it', () => {
    const windows = new WindowRegistry()
    windows.add(1, { recovery: { text: '{}', savedAt: '2025-03-01T12:00:00Z', name: 'x', path: '/data/a.mote' } }, '/r/1.json')
    expect(windows.savePathWithoutAsking(1, { path: '/data/a.mote', saveAs: false })).toBeNull()
  })

  it('remembers a path chosen in a save dialog, for this window only', () => {
    const windows = new WindowRegistry()
    windows.add(1, {}, '/r/1.json')
    windows.add(2, {}, '/r/2.json')
    windows.grant(1, '/data/new.mote')
    expect(windows.savePathWithoutAsking(1, { path: '/data/new.mote', saveAs: false })).toBe('/data/new.mote')
    expect(windows.savePathWithoutAsking(2, { path: '/data/new.mote', saveAs: false })).toBeNull()
  })

  it('opens a study into a window that holds nothing yet, else into a new one', () => {
    const windows = new WindowRegistry()
    windows.add(1, {}, '/r/1.json')
    windows.add(2, { file }, '/r/2.json')
    expect(windows.opensInto(1)).toBe('this-window')
    expect(windows.opensInto(2)).toBe('new-window')
    expect(windows.opensInto(undefined)).toBe('new-window')
    windows.report(1, { title: 'Demo', dirty: true, pristine: false })
    expect(windows.opensInto(1)).toBe('new-window')
  })

  it('keeps what the window reports', () => {
    const windows = new WindowRegistry()
    windows.add(1, {}, '/r/1.json')
    windows.report(1, { title: 'Valley winter', dirty: true, pristine: false })
    expect(windows.get(1)).toMatchObject({ title: 'Valley winter', dirty: true, pristine: false, closing: false })
  })

  it('refuses messages from windows it does not know, saying why', () => {
    const windows = new WindowRegistry()
    windows.add(1, {}, '/r/1.json')
    windows.remove(1)
    expect(() => windows.require(1)).toThrow(/not a study window/)
    expect(() => windows.report(7, { title: 'x', dirty: false, pristine: true })).toThrow(/web contents 7/)
    expect(windows.size).toBe(0)
  })
})
