// Saving study files atomically, keeping the previous version, and refusing to overwrite outside changes.
import { mkdtemp, readdir, readFile, rm, stat, utimes, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { demoStudy, serializeStudy } from '../../src-core/index.ts'
import { backupPathFor, FileChangedError, loadStudyFile, saveStudyFile, saveTextAtomically, StudyFileError } from '../../src-main/files.ts'

let dir: string
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-files-'))
})
afterEach(async () => {
  await rm(dir, { recursive: true, force: true })
})

const failing = (code: string) => async (): Promise<never> => {
  throw Object.assign(new Error(`simulated ${code}`), { code })
}

describe('saveTextAtomically', () => {
  it('creates a new file without a backup and leaves no temporary file', async () => {
    const path = join(dir, 'a.mote')
    const saved = await saveTextAtomically(path, 'first\n')
    expect(await readFile(path, 'utf8')).toBe('first\n')
    expect(saved.backupPath).toBeUndefined()
    expect(await readdir(dir)).toEqual(['a.mote'])
    expect(saved.mtimeMs).toBe((await stat(path)).mtimeMs)
  })

  it('keeps the previous version as PATH.bak', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'old\n')
    const saved = await saveTextAtomically(path, 'new\n')
    expect(await readFile(path, 'utf8')).toBe('new\n')
    expect(saved.backupPath).toBe(backupPathFor(path))
    expect(await readFile(`${path}.bak`, 'utf8')).toBe('old\n')
    expect((await readdir(dir)).sort()).toEqual(['a.mote', 'a.mote.bak'])
  })

  it('a failed rename leaves the old file intact and removes the temporary file', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'old\n')
    await expect(saveTextAtomically(path, 'new\n', { io: { rename: failing('EXDEV') } })).rejects.toThrow('simulated EXDEV')
    expect(await readFile(path, 'utf8')).toBe('old\n')
    expect((await readdir(dir)).filter((f) => f.endsWith('.tmp'))).toEqual([])
  })

  it('a failed write (disk full) leaves the old file intact', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'old\n')
    await expect(saveTextAtomically(path, 'new\n', { io: { open: failing('ENOSPC') } })).rejects.toThrow('simulated ENOSPC')
    expect(await readFile(path, 'utf8')).toBe('old\n')
    expect(await readdir(dir)).toEqual(['a.mote'])
  })

  it('a failed backup copy leaves the old file intact', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'old\n')
    await expect(saveTextAtomically(path, 'new\n', { io: { copyFile: failing('EACCES') } })).rejects.toThrow('simulated EACCES')
    expect(await readFile(path, 'utf8')).toBe('old\n')
    expect(await readdir(dir)).toEqual(['a.mote'])
  })

  it('refuses to overwrite a file changed on disk since it was read, unless forced', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'mine\n')
    const opened = await stat(path)
    // another program saves the file a few seconds later
    await writeFile(path, 'theirs, longer\n')
    await utimes(path, new Date(opened.mtimeMs + 5000), new Date(opened.mtimeMs + 5000))
    const attempt = saveTextAtomically(path, 'mine, edited\n', { expectedMtimeMs: opened.mtimeMs, expectedSize: opened.size })
    await expect(attempt).rejects.toBeInstanceOf(FileChangedError)
    await expect(attempt).rejects.toThrow(/changed on disk/)
    expect(await readFile(path, 'utf8')).toBe('theirs, longer\n')

    await saveTextAtomically(path, 'mine, edited\n', { expectedMtimeMs: opened.mtimeMs, force: true })
    expect(await readFile(path, 'utf8')).toBe('mine, edited\n')
    expect(await readFile(`${path}.bak`, 'utf8')).toBe('theirs, longer\n')
  })

  it('notices a change of size even when the mtime was restored', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'mine\n')
    const opened = await stat(path)
    await writeFile(path, 'theirs, longer\n')
    await utimes(path, opened.atime, opened.mtime)
    await expect(saveTextAtomically(path, 'x\n', { expectedMtimeMs: (await stat(path)).mtimeMs, expectedSize: opened.size })).rejects.toBeInstanceOf(FileChangedError)
  })

  it('refuses when the file was deleted since it was read', async () => {
    const path = join(dir, 'a.mote')
    await writeFile(path, 'mine\n')
    const opened = await stat(path)
    await rm(path)
    await expect(saveTextAtomically(path, 'x\n', { expectedMtimeMs: opened.mtimeMs })).rejects.toThrow(/deleted or moved/)
  })

  it('saving again with the mtime returned by the last save works', async () => {
    const path = join(dir, 'a.mote')
    const first = await saveTextAtomically(path, 'one\n')
    const second = await saveTextAtomically(path, 'two\n', { expectedMtimeMs: first.mtimeMs, expectedSize: first.size })
    await saveTextAtomically(path, 'three\n', { expectedMtimeMs: second.mtimeMs, expectedSize: second.size })
    expect(await readFile(path, 'utf8')).toBe('three\n')
  })
})

describe('loadStudyFile and saveStudyFile', () => {
  it('loads a study with the mtime to save it back', async () => {
    const path = join(dir, 'demo.mote')
    await saveStudyFile(path, demoStudy())
    const loaded = await loadStudyFile(path)
    expect(loaded.study).toEqual(demoStudy())
    expect(loaded.mtimeMs).toBe((await stat(path)).mtimeMs)
    loaded.study.name = 'Edited demo'
    await saveStudyFile(path, loaded.study, { expectedMtimeMs: loaded.mtimeMs, expectedSize: loaded.size })
    expect((await loadStudyFile(path)).study.name).toBe('Edited demo')
  })

  it('refuses an invalid study, listing every problem', async () => {
    const path = join(dir, 'bad.mote')
    const d = JSON.parse(serializeStudy(demoStudy()))
    d.site.latitude_deg = 100
    d.samples[0].rh_percent = 120
    await writeFile(path, JSON.stringify(d))
    const err = await loadStudyFile(path).catch((e: unknown) => e)
    expect(err).toBeInstanceOf(StudyFileError)
    expect((err as StudyFileError).problems.map((p) => p.path).sort()).toEqual(['samples[0].rh_percent', 'site.latitude_deg'])
  })
})
