// The recent-studies list: order, no repeats, trimming, missing files, and a write that never half-replaces it.
import { mkdtemp, open, readdir, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { readRecentList, RecentStudies, withStudyFirst } from '../../src-main/recent-studies.ts'

let dir: string
let listFile: string
beforeEach(async () => {
  dir = await mkdtemp(join(tmpdir(), 'motebench-recent-'))
  listFile = join(dir, 'settings', 'recent.json')
})
afterEach(async () => {
  await rm(dir, { recursive: true, force: true })
})

/** Creates study files and returns their paths. */
async function studies(...names: string[]): Promise<string[]> {
  return Promise.all(
    names.map(async (n) => {
      const p = join(dir, n)
      await writeFile(p, '{}')
      return p
    })
  )
}

describe('withStudyFirst', () => {
  it('puts the study first and keeps the others in order', () => {
    expect(withStudyFirst(['/b', '/c'], '/a')).toEqual(['/a', '/b', '/c'])
  })

  it('moves a study already on the list instead of repeating it', () => {
    expect(withStudyFirst(['/a', '/b', '/c'], '/c')).toEqual(['/c', '/a', '/b'])
  })

  it('drops the oldest beyond the limit', () => {
    expect(withStudyFirst(['/a', '/b', '/c'], '/d', 3)).toEqual(['/d', '/a', '/b'])
  })
})

describe('readRecentList', () => {
  it('treats a damaged or foreign file as an empty list', () => {
    expect(readRecentList('["/a.mote", "/b.mo')).toEqual([])
    expect(readRecentList('{"recent": ["/a.mote"]}')).toEqual([])
    expect(readRecentList('')).toEqual([])
  })

  it('keeps only paths, once each', () => {
    expect(readRecentList('["/a.mote", 3, null, "", "/b.mote", "/a.mote"]')).toEqual(['/a.mote', '/b.mote'])
  })
})

describe('RecentStudies', () => {
  it('starts empty when there is no file yet', async () => {
    expect(await new RecentStudies(listFile).list()).toEqual([])
  })

  it('lists studies newest first without repeats, and keeps the list for the next start', async () => {
    const [a, b, c] = await studies('a.mote', 'b.mote', 'c.mote')
    const recent = new RecentStudies(listFile)
    await recent.add(a)
    await recent.add(b)
    await recent.add(c)
    await recent.add(a)
    expect(await recent.list()).toEqual([a, c, b])
    expect(await new RecentStudies(listFile).list()).toEqual([a, c, b])
    expect(JSON.parse(await readFile(listFile, 'utf8'))).toEqual([a, c, b])
  })

  it('keeps at most its limit', async () => {
    const paths = await studies('1.mote', '2.mote', '3.mote', '4.mote', '5.mote')
    const recent = new RecentStudies(listFile, { limit: 3 })
    for (const p of paths) await recent.add(p)
    expect(await recent.list()).toEqual([paths[4], paths[3], paths[2]])
  })

  it('leaves out studies that were deleted or moved', async () => {
    const [a, b] = await studies('a.mote', 'b.mote')
    const recent = new RecentStudies(listFile)
    await recent.add(a)
    await recent.add(b)
    await rm(b)
    expect(await recent.list()).toEqual([a])
    const [c] = await studies('c.mote')
    expect(await recent.add(c)).toEqual([c, a])
  })

  it('records relative paths as absolute ones', async () => {
    const recent = new RecentStudies(listFile, { exists: async () => true })
    const list = await recent.add('relative/x.mote')
    expect(list[0]).toBe(join(process.cwd(), 'relative/x.mote'))
  })

  it('loses none of several additions made at once', async () => {
    const paths = await studies('1.mote', '2.mote', '3.mote', '4.mote', '5.mote')
    const recent = new RecentStudies(listFile)
    await Promise.all(paths.map((p) => recent.add(p)))
    expect([...(await recent.list())].sort()).toEqual([...paths].sort())
  })

  it('never replaces the list with a half-written file, and leaves no temporary file', async () => {
    const [a, b] = await studies('a.mote', 'b.mote')
    await new RecentStudies(listFile).add(a)
    const before = await readFile(listFile, 'utf8')
    // The disk fills up part-way through writing the new list.
    const recent = new RecentStudies(listFile, {
      io: {
        open: (async (path: string, flags: string, mode?: number) => {
          const handle = await open(path, flags, mode)
          if (flags === 'wx') {
            handle.writeFile = async (data: unknown) => {
              await handle.write(String(data).slice(0, 5))
              throw Object.assign(new Error('simulated ENOSPC'), { code: 'ENOSPC' })
            }
          }
          return handle
        }) as typeof open
      }
    })
    await expect(recent.add(b)).rejects.toThrow(/ENOSPC/)
    expect(await readFile(listFile, 'utf8')).toBe(before)
    expect(await readdir(join(dir, 'settings'))).toEqual(['recent.json'])
    expect(await recent.list()).toEqual([a])
  })

  it('never replaces the list when the final rename fails, and goes on working afterwards', async () => {
    const [a, b, c] = await studies('a.mote', 'b.mote', 'c.mote')
    await new RecentStudies(listFile).add(a)
    let failures = 1
    const recent = new RecentStudies(listFile, {
      io: {
        rename: async (from, to) => {
          if (failures-- > 0) throw Object.assign(new Error('simulated EIO'), { code: 'EIO' })
          const { rename } = await import('node:fs/promises')
          return rename(from, to)
        }
      }
    })
    await expect(recent.add(b)).rejects.toThrow(/EIO/)
    expect(await recent.list()).toEqual([a])
    expect(await readdir(join(dir, 'settings'))).toEqual(['recent.json'])
    expect(await recent.add(c)).toEqual([c, a])
  })
})
