// The Content-Security-Policy: the app's own files only, and the same in the page's <meta> tag and in headers.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { CONTENT_POLICY, contentPolicyText, parseContentPolicy, withContentPolicy } from '../../src-main/content-policy.ts'

const policy = parseContentPolicy(contentPolicyText())
/** Sources that name no origin beyond the page itself. */
const LOCAL_SOURCES = new Set(["'self'", "'none'", "'unsafe-inline'", 'data:', 'blob:'])

describe('the content policy', () => {
  it("starts from default-src 'self'", () => {
    expect(policy['default-src']).toEqual(["'self'"])
  })

  it('names no remote origin, host, scheme or wildcard anywhere', () => {
    for (const [directive, sources] of Object.entries(policy)) {
      for (const source of sources) expect(LOCAL_SOURCES.has(source), `${directive} ${source}`).toBe(true)
    }
  })

  it('runs no inline or evaluated script, and no plugins, frames, forms or base changes', () => {
    expect(policy['script-src']).toEqual(["'self'"])
    expect(contentPolicyText()).not.toContain('unsafe-eval')
    for (const d of ['object-src', 'frame-src', 'form-action', 'base-uri']) expect(policy[d], d).toEqual(["'none'"])
  })

  it('reads back to the directives it was written from', () => {
    expect(policy).toEqual(Object.fromEntries(Object.entries(CONTENT_POLICY).map(([k, v]) => [k, [...v]])))
  })

  it("is the policy of the renderer page's <meta> tag", () => {
    const html = readFileSync(join(import.meta.dirname, '../../src-renderer/index.html'), 'utf8')
    const meta = /<meta\s+http-equiv="Content-Security-Policy"\s+content="([^"]*)"/i.exec(html)
    expect(meta, 'src-renderer/index.html has a Content-Security-Policy meta tag').not.toBeNull()
    expect(parseContentPolicy(meta![1])).toEqual(policy)
  })
})

describe('withContentPolicy', () => {
  it('replaces a policy the response brought, whatever its letter case, and keeps the other headers', () => {
    const headers = withContentPolicy({ 'content-security-policy': ["default-src *"], 'Content-Type': ['text/html'], 'X-One': 'a' })
    expect(Object.keys(headers).filter((k) => k.toLowerCase() === 'content-security-policy')).toEqual(['Content-Security-Policy'])
    expect(headers['Content-Security-Policy']).toEqual([contentPolicyText()])
    expect(headers['Content-Type']).toEqual(['text/html'])
    expect(headers['X-One']).toEqual(['a'])
  })

  it('adds the policy to a response without headers', () => {
    expect(withContentPolicy(undefined)).toEqual({ 'Content-Security-Policy': [contentPolicyText()] })
  })
})
