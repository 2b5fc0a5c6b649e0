// Recovery copies: found after a crash, gone after a clean close or a refusal, never taken from a running instance.
import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { basename, join } from 'node:path'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import type { RecoveryCopy } from '../../src-main/host-api.ts'
import { RecoveryStore } from '../../src-main/recovery-store.ts'

let dir: string
beforeEach(async () => {
  dir = join(await mkdtemp(join(tmpdir(), 'motebench-recovery-')), 'recovery')
})
afterEach(async () => {
  await rm(join(dir, '..'), { recursive: true, force: true })
})

const copy = (name: string, savedAt = '2025-03-01T12:00:00.000Z'): RecoveryCopy => ({ text: `{"name":"${name}"}`, savedAt, name })

/** Two processes sharing the folder: `first` (pid 101) and `second` (pid 202); `alive` says which still run. */
function twoProcesses(alive: Set<number>) {
  const isRunning = (pid: number) => alive.has(pid)
  return { first: new RecoveryStore(dir, { pid: 101, isRunning }), second: new RecoveryStore(dir, { pid: 202, isRunning }) }
}

describe('RecoveryStore', () => {
  it('finds a copy left by a process that crashed', async () => {
    const alive = new Set([101, 202])
    const { first, second } = twoProcesses(alive)
    await first.keep(first.newSlot(), copy('Valley winter'))
    alive.delete(101) // the first process dies without closing its window
    const found = await second.leftovers()
    expect(found.map((f) => f.copy)).toEqual([copy('Valley winter')])
  })

  it('finds nothing after a clean close', async () => {
    const alive = new Set([101, 202])
    const { first, second } = twoProcesses(alive)
    const slot = first.newSlot()
    await first.keep(slot, copy('Valley winter'))
    await first.discard(slot)
    alive.delete(101)
    expect(await second.leftovers()).toEqual([])
    expect(await readdir(dir)).toEqual([])
  })

  it('keeps only the latest copy of a window', async () => {
    const alive = new Set([202])
    const { first, second } = twoProcesses(alive)
    const slot = first.newSlot()
    await first.keep(slot, copy('draft 1', '2025-03-01T12:00:00.000Z'))
    await first.keep(slot, copy('draft 2', '2025-03-01T12:00:20.000Z'))
    expect((await second.leftovers()).map((f) => f.copy.name)).toEqual(['draft 2'])
  })

  it('does not take the copies of an instance that is still running, nor its own', async () => {
    const { first, second } = twoProcesses(new Set([101, 202]))
    await first.keep(first.newSlot(), copy('first window'))
    await second.keep(second.newSlot(), copy('second window'))
    expect(await second.leftovers()).toEqual([])
    expect(await first.leftovers()).toEqual([])
  })

  it('treats this very process as running when asked the operating system', async () => {
    const writer = new RecoveryStore(dir, { pid: process.pid })
    await writer.keep(writer.newSlot(), copy('live'))
    const reader = new RecoveryStore(dir, { pid: process.pid + 1 })
    expect(await reader.leftovers()).toEqual([])
  })

  it('lists several leftovers newest first', async () => {
    const { first, second } = twoProcesses(new Set([202]))
    await first.keep(first.newSlot(), copy('older', '2025-03-01T09:00:00.000Z'))
    await first.keep(first.newSlot(), copy('newer', '2025-03-01T11:00:00.000Z'))
    await first.keep(first.newSlot(), copy('middle', '2025-03-01T10:00:00Z'))
    expect((await second.leftovers()).map((f) => f.copy.name)).toEqual(['newer', 'middle', 'older'])
  })

  it('hands an adopted copy to the new window: another instance cannot take it, a refusal removes it', async () => {
    const alive = new Set([202, 303])
    const { first, second } = twoProcesses(alive)
    await first.keep(first.newSlot(), copy('Valley winter'))
    const [leftover] = await second.leftovers()
    const slot = await second.adopt(leftover)
    expect(slot).not.toBeNull()
    expect(JSON.parse(await readFile(slot!, 'utf8'))).toEqual(copy('Valley winter'))
    const third = new RecoveryStore(dir, { pid: 303, isRunning: (pid) => alive.has(pid) })
    expect(await third.leftovers()).toEqual([])
    // The user declines to restore it.
    await second.discard(slot!)
    expect(await readdir(dir)).toEqual([])
  })

  it('offers an adopted copy again if the adopting process crashes too', async () => {
    const alive = new Set([202, 303])
    const { first, second } = twoProcesses(alive)
    await first.keep(first.newSlot(), copy('Valley winter'))
    await second.adopt((await second.leftovers())[0])
    alive.delete(202)
    const third = new RecoveryStore(dir, { pid: 303, isRunning: (pid) => alive.has(pid) })
    expect((await third.leftovers()).map((f) => f.copy.name)).toEqual(['Valley winter'])
  })

  it('gives up a copy another instance adopted first', async () => {
    const { first, second } = twoProcesses(new Set([202]))
    await first.keep(first.newSlot(), copy('Valley winter'))
    const [leftover] = await second.leftovers()
    expect(await second.adopt(leftover)).not.toBeNull()
    expect(await second.adopt(leftover)).toBeNull()
  })

  it('removes copies that cannot be restored, and unfinished writes of ended processes only', async () => {
    const { first, second } = twoProcesses(new Set([202]))
    await first.keep(first.newSlot(), copy('good'))
    await writeFile(join(dir, 'window-101-7.json'), '{"text": "half')
    await writeFile(join(dir, 'window-101-8.json'), JSON.stringify({ text: 'x', savedAt: 'yesterday', name: 'bad time' }))
    await writeFile(join(dir, '.window-101-9.json.101-0a1b2c3d.tmp'), 'half')
    await writeFile(join(dir, '.window-202-1.json.202-0a1b2c3d.tmp'), 'being written')
    await writeFile(join(dir, 'notes.txt'), 'not a copy')
    expect((await second.leftovers()).map((f) => f.copy.name)).toEqual(['good'])
    expect((await readdir(dir)).sort()).toEqual(['.window-202-1.json.202-0a1b2c3d.tmp', 'notes.txt', 'window-101-1.json'])
  })

  it('finds nothing when the folder does not exist yet', async () => {
    expect(await new RecoveryStore(join(dir, 'never-made')).leftovers()).toEqual([])
  })

  it('names each window its own file', () => {
    const store = new RecoveryStore(dir, { pid: 101 })
    const a = store.newSlot()
    const b = store.newSlot()
    expect(a).not.toBe(b)
    expect(basename(a)).toMatch(/^window-101-\d+\.json$/)
  })
})
