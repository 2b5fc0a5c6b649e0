// The preload (src-main/preload.ts) against a stand-in Electron: what it exposes, the channels it uses, and the
// messages it lets through to the page.
import { beforeAll, describe, expect, it, vi } from 'vitest'
import { CHANNELS, type Host } from '../../src-main/host-api.ts'
import { checkMessage, type ChannelName } from '../../src-main/ipc-schemas.ts'

const bridge = vi.hoisted(() => ({
  exposed: new Map<string, unknown>(),
  invoked: [] as [string, unknown][],
  sent: [] as [string, unknown][],
  listeners: new Map<string, Set<(e: unknown, v: unknown) => void>>()
}))
vi.mock('electron', () => ({
  contextBridge: { exposeInMainWorld: (key: string, api: unknown) => void bridge.exposed.set(key, api) },
  ipcRenderer: {
    invoke: async (channel: string, arg?: unknown) => void bridge.invoked.push([channel, arg]),
    send: (channel: string, arg?: unknown) => void bridge.sent.push([channel, arg]),
    on: (channel: string, fn: (e: unknown, v: unknown) => void) => {
      if (!bridge.listeners.has(channel)) bridge.listeners.set(channel, new Set())
      bridge.listeners.get(channel)!.add(fn)
    },
    removeListener: (channel: string, fn: (e: unknown, v: unknown) => void) => void bridge.listeners.get(channel)?.delete(fn)
  }
}))

/** Main sends a message to the page. */
const fromMain = (channel: string, value: unknown) => bridge.listeners.get(channel)?.forEach((fn) => fn({}, value))
const channelName = (channel: string) => (Object.entries(CHANNELS).find(([, c]) => c === channel)?.[0] ?? channel) as ChannelName

let host: Host
beforeAll(async () => {
  await import('../../src-main/preload.ts')
  host = bridge.exposed.get('motebenchHost') as Host
})

describe('the preload', () => {
  it('exposes the desktop host to the page under one name, and nothing else', () => {
    expect([...bridge.exposed.keys()]).toEqual(['motebenchHost'])
    expect(host.kind).toBe('desktop')
  })

  it('sends every request on its channel, in a form main accepts', async () => {
    await host.startUp()
    await host.openStudy()
    await host.saveStudy({ text: '{}', suggestedName: 'valley.mote', saveAs: false })
    await host.openSizerFile()
    await host.openInstrumentFiles()
    await host.readInstrumentFile('/data/station/neph.csv')
    await host.exportFile({ suggestedName: 'results.csv', kind: 'csv', text: 'a,b\n' })
    await host.printReport({ suggestedName: 'report.pdf' })
    await host.keepRecovery(null)
    host.setState({ title: 'Valley winter', dirty: true, pristine: false })
    host.closeWindow()
    const used = [...bridge.invoked, ...bridge.sent]
    const toMain = Object.values(CHANNELS).filter((c) => c !== CHANNELS.command && c !== CHANNELS.load)
    expect(used.map(([c]) => c).sort()).toEqual([...toMain].sort())
    for (const [channel, message] of used) expect(() => checkMessage(channelName(channel), message), channel).not.toThrow()
    expect(bridge.sent.map(([c]) => c).sort()).toEqual([CHANNELS.closeWindow, CHANNELS.setState].sort())
  })

  it('passes known menu commands to the page and drops anything else', () => {
    const got: string[] = []
    const stop = host.onCommand((c) => got.push(c))
    fromMain(CHANNELS.command, 'save')
    fromMain(CHANNELS.command, 'format-disk')
    fromMain(CHANNELS.command, { command: 'save' })
    stop()
    fromMain(CHANNELS.command, 'undo')
    expect(got).toEqual(['save'])
  })

  it('passes files to load only when they have a name and text', () => {
    const got: unknown[] = []
    const stop = host.onLoad((f) => got.push(f))
    fromMain(CHANNELS.load, { name: 'a.mote', text: '{}' })
    fromMain(CHANNELS.load, { name: 'b.mote' })
    fromMain(CHANNELS.load, 'c.mote')
    fromMain(CHANNELS.load, null)
    stop()
    expect(got).toEqual([{ name: 'a.mote', text: '{}' }])
  })
})
