// The decision modules of src-main run under plain Node: none loads Electron at run time.
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'

const SRC = join(import.meta.dirname, '../../src-main')
/** main.ts and preload.ts are the Electron glue; every other module must load without Electron. */
const GLUE = new Set(['main.ts', 'preload.ts'])
const modules = readdirSync(SRC).filter((f) => f.endsWith('.ts') && !GLUE.has(f))

/** Imports of 'electron' that are not `import type` (those are erased when compiled). */
function runtimeElectronImports(source: string): string[] {
  const found: string[] = []
  for (const m of source.matchAll(/\bimport\s+([^'"]*?)\s*from\s*['"]electron['"]/g)) if (!/^type\b/.test(m[1])) found.push(m[0])
  for (const m of source.matchAll(/\b(?:require|import)\s*\(\s*['"]electron['"]\s*\)/g)) found.push(m[0])
  for (const m of source.matchAll(/\bexport\s+(?!type\b)[^'"]*from\s*['"]electron['"]/g)) found.push(m[0])
  return found
}

describe('Electron-free modules', () => {
  it('are the ones main.ts takes its decisions from', () => {
    const main = readFileSync(join(SRC, 'main.ts'), 'utf8')
    for (const name of ['closing', 'content-policy', 'menu', 'navigation', 'recent-studies', 'recovery-store', 'start-up', 'study-saving', 'window-options', 'window-registry']) {
      expect(modules, name).toContain(`${name}.ts`)
      expect(main, `main.ts uses ${name}.ts`).toContain(`'./${name}.ts'`)
    }
  })

  it.each(modules)('%s imports Electron for types only', (file) => {
    expect(runtimeElectronImports(readFileSync(join(SRC, file), 'utf8'))).toEqual([])
  })

  it.each(modules)('%s loads under plain Node', async (file) => {
    await expect(import(join(SRC, file))).resolves.toBeTypeOf('object')
  })

  it('the check itself tells a runtime import from a type import', () => {
    expect(runtimeElectronImports("import { app } from 'electron'")).toHaveLength(1)
    expect(runtimeElectronImports("import type { App } from 'electron'")).toEqual([])
    expect(runtimeElectronImports("const e = require('electron')")).toHaveLength(1)
  })
})
