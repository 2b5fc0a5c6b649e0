// Instruments are named by generic kind only (mobility sizer, aerodynamic sizer, optical particle counter,
// nephelometer, absorption photometer): no maker's or model's name or acronym in code, comments, messages,
// documentation or resources (the project's rules). Scans every text file git tracks.
import { execFileSync } from 'node:child_process'
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { describe, expect, it } from 'vitest'

const repo = fileURLToPath(new URL('../../', import.meta.url))
const TEXT = /\.(ts|tsx|mts|mjs|js|json|md|html|css|py|csv|txt|mote|svg|yml|yaml)$/

/** Maker-derived acronyms of particle instruments (common practice), and the generic one used as a message prefix. */
const FORBIDDEN = /\b(SMPS|APS|UHSAS|PCASP|CPC|DMPS|SEMS|ELPI|OPCs?)\b|['"`]opc: /

describe('instrument names', () => {
  it('no tracked text file names an instrument by an acronym', () => {
    const files = execFileSync('git', ['ls-files'], { cwd: repo, encoding: 'utf8' })
      .split('\n')
      .filter((f) => TEXT.test(f) && f !== 'test/repo/instrument-names.test.ts' && f !== 'package-lock.json')
    const hits: string[] = []
    for (const f of files) {
      let text: string
      try {
        text = readFileSync(join(repo, f), 'utf8')
      } catch {
        continue // listed by git but deleted in the working tree
      }
      text.split('\n').forEach((line, i) => {
        if (FORBIDDEN.test(line)) hits.push(`${f}:${i + 1}: ${line.trim().slice(0, 120)}`)
      })
    }
    expect(hits).toEqual([])
  })
})
