// Reading chosen files and saving studies: a change made on disk meanwhile is never overwritten without asking.
import { mkdir, mkdtemp, open, readFile, rm, stat, utimes, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { MAX_TEXT } from '../../src-main/ipc-schemas.ts'
import { FileReadError, overwriteChosen, overwriteQuestion, readChosenFile, StudyFiles } from '../../src-main/study-saving.ts'

let dir: string
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-saving-'))
})
afterEach(async () => {
  await rm(dir, { recursive: true, force: true })
})

/** Another program writes the file: new content and a later modification time. */
async function changeOnDisk(path: string, text: string): Promise<void> {
  await writeFile(path, text)
  const later = new Date((await stat(path)).mtimeMs + 5000)
  await utimes(path, later, later)
}

describe('StudyFiles', () => {
  it('reads a study with its name and path', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, '{"study": 1}')
    expect(await new StudyFiles().read(path)).toEqual({ name: 'valley.mote', path, text: '{"study": 1}' })
  })

  it('saves over a file unchanged since it was read, without asking', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, 'v1')
    const files = new StudyFiles()
    await files.read(path)
    const ask = vi.fn(() => true)
    expect(await files.save(path, 'v2', ask)).toBe(true)
    expect(ask).not.toHaveBeenCalled()
    expect(await readFile(path, 'utf8')).toBe('v2')
  })

  it('asks before overwriting a file changed on disk, and leaves it alone when told not to', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, 'v1')
    const files = new StudyFiles()
    await files.read(path)
    await changeOnDisk(path, 'changed elsewhere')
    const ask = vi.fn(() => false)
    expect(await files.save(path, 'mine', ask)).toBe(false)
    expect(ask).toHaveBeenCalledWith(path)
    expect(await readFile(path, 'utf8')).toBe('changed elsewhere')
  })

  it('overwrites when told to, keeping the other version as .bak', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, 'v1')
    const files = new StudyFiles()
    await files.read(path)
    await changeOnDisk(path, 'changed elsewhere')
    expect(await files.save(path, 'mine', async () => true)).toBe(true)
    expect(await readFile(path, 'utf8')).toBe('mine')
    expect(await readFile(`${path}.bak`, 'utf8')).toBe('changed elsewhere')
  })

  it('asks when the file was deleted since it was read', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, 'v1')
    const files = new StudyFiles()
    await files.read(path)
    await rm(path)
    const ask = vi.fn(() => false)
    expect(await files.save(path, 'mine', ask)).toBe(false)
    expect(ask).toHaveBeenCalledOnce()
  })

  it('does not ask again after its own save', async () => {
    const path = join(dir, 'valley.mote')
    const files = new StudyFiles()
    const ask = vi.fn(() => true)
    await files.save(path, 'v1', ask)
    await files.save(path, 'v2', ask)
    expect(ask).not.toHaveBeenCalled()
    expect(await readFile(path, 'utf8')).toBe('v2')
  })

  it('leaves the file as it was when the save fails part-way', async () => {
    const path = join(dir, 'valley.mote')
    await writeFile(path, 'v1')
    const files = new StudyFiles({ io: { rename: async () => Promise.reject(Object.assign(new Error('simulated EIO'), { code: 'EIO' })) } })
    await files.read(path)
    await expect(files.save(path, 'v2', () => true)).rejects.toThrow(/EIO/)
    expect(await readFile(path, 'utf8')).toBe('v1')
  })
})

describe('readChosenFile', () => {
  it('says a missing file is not there and how to find it again', async () => {
    const path = join(dir, 'gone.mote')
    const error = await readChosenFile(path).catch((e: unknown) => e)
    expect(error).toBeInstanceOf(FileReadError)
    expect((error as Error).message).toContain(path)
    expect((error as Error).message).toMatch(/not there.*open it again/)
  })

  it('refuses a folder', async () => {
    const path = join(dir, 'folder.mote')
    await mkdir(path)
    await expect(readChosenFile(path)).rejects.toThrow(/folder, not a file/)
  })

  it('refuses a file too large to be a study or sizer export, before reading it', async () => {
    const path = join(dir, 'huge.csv')
    const handle = await open(path, 'w')
    await handle.truncate(MAX_TEXT + 1)
    await handle.close()
    await expect(readChosenFile(path)).rejects.toThrow(/MB.*smaller file/)
  })

  it('reads UTF-8 text and records the file state', async () => {
    const path = join(dir, 'sizer.csv')
    await writeFile(path, 'diameter (µm);dN/dlogD\n0.1;1000\n')
    const r = await readChosenFile(path)
    expect(r.file.text).toBe('diameter (µm);dN/dlogD\n0.1;1000\n')
    expect(r.size).toBe((await stat(path)).size)
  })
})

describe('the overwrite question', () => {
  it('names the file and where the other version is kept', () => {
    const q = overwriteQuestion('/data/valley.mote')
    expect(q.detail).toContain('/data/valley.mote')
    expect(q.detail).toContain('valley.mote.bak')
  })

  it('overwrites only on the Overwrite button; Enter and Escape keep the file', () => {
    const q = overwriteQuestion('/data/valley.mote')
    expect(overwriteChosen(q.buttons!.indexOf('Overwrite'))).toBe(true)
    expect(overwriteChosen(q.defaultId!)).toBe(false)
    expect(overwriteChosen(q.cancelId!)).toBe(false)
  })
})

describe('readInstrumentFile', () => {
  it('gives the fingerprint of the whole text, so an edit in the middle of a long file is noticed', async () => {
    const { readInstrumentFile } = await import('../../src-main/study-saving.ts')
    const { fileChange, textFingerprint, wholeTextFingerprint } = await import('../../src-core/index.ts')
    // an invented instrument file of about 260 000 characters: far more than the sampled fingerprint's two 64 Ki ends
    const rows = Array.from({ length: 10_000 }, (_, i) => `2026-07-14T${String(Math.floor(i / 60) % 24).padStart(2, '0')}:${String(i % 60).padStart(2, '0')}:00Z,${(i % 97) + 0.5}`)
    const text = 'time,scattering 550 nm [Mm-1]\n' + rows.join('\n') + '\n'
    expect(text.length).toBeGreaterThan(3 * 65536)
    const path = join(dir, 'neph.csv')
    await writeFile(path, text)
    const first = await readInstrumentFile(path)
    expect(first).toMatchObject({ name: 'neph.csv', path, text })
    expect(first.fingerprint).toBe(wholeTextFingerprint(text))
    // one digit in the middle, same length: the ends are unchanged, so only the whole-text fingerprint sees it
    const mid = text.indexOf(',', text.length >> 1) + 1
    const edited = text.slice(0, mid) + (text[mid] === '9' ? '8' : '9') + text.slice(mid + 1)
    expect(edited.length).toBe(text.length)
    await writeFile(path, edited)
    const second = await readInstrumentFile(path)
    expect(textFingerprint(edited)).toBe(textFingerprint(text))
    expect(second.fingerprint).not.toBe(first.fingerprint)
    // as the record's session compares them: a kept whole-text fingerprint against the host's new one
    const ref = { size: text.length, hash: first.fingerprint }
    expect(fileChange(ref, text, first.fingerprint)).toBeUndefined()
    expect(fileChange(ref, edited, second.fingerprint)).toBe('its contents differ')
    expect(fileChange(ref, edited + 'x')).toMatch(/size went from \d+ to \d+ characters/)
    // a study saved before (a sampled fingerprint) is still compared as it was made
    expect(fileChange({ size: text.length, hash: textFingerprint(text) }, edited, second.fingerprint)).toBeUndefined()
    expect(fileChange({ size: text.length, hash: textFingerprint(text) }, 'X' + text.slice(1), second.fingerprint)).toBe('its contents differ')
  })
})
