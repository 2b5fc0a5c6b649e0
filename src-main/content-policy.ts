// The Content-Security-Policy of the app's page: its own files only, no remote origin, no plugins, no frames.

/**
 * Directive → sources. Only keywords and the local data:/blob: schemes (images and workers made in the page).
 * src-renderer/index.html carries the same policy in a <meta> tag (test/desktop/content-policy.test.ts keeps them equal).
 */
export const CONTENT_POLICY: Readonly<Record<string, readonly string[]>> = {
  'default-src': ["'self'"],
  'script-src': ["'self'"],
  'style-src': ["'self'", "'unsafe-inline'"],
  'img-src': ["'self'", 'data:', 'blob:'],
  'font-src': ["'self'"],
  'worker-src': ["'self'", 'blob:'],
  'connect-src': ["'self'"],
  'object-src': ["'none'"],
  'base-uri': ["'none'"],
  'form-action': ["'none'"],
  'frame-src': ["'none'"]
}

/** The policy as one header value: `default-src 'self'; script-src 'self'; …`. */
export function contentPolicyText(policy: Readonly<Record<string, readonly string[]>> = CONTENT_POLICY): string {
  return Object.entries(policy)
    .map(([directive, sources]) => [directive, ...sources].join(' '))
    .join('; ')
}

/** Reads a policy's text back into directive → sources (names lower-cased; later repeats ignored, as browsers do). */
export function parseContentPolicy(text: string): Record<string, string[]> {
  const policy: Record<string, string[]> = {}
  for (const part of text.split(';')) {
    const [name, ...sources] = part.trim().split(/\s+/).filter(Boolean)
    if (!name) continue
    const key = name.toLowerCase()
    if (!(key in policy)) policy[key] = sources
  }
  return policy
}

/** Response headers with the app's policy in place of any policy the response brought (whatever its letter case). */
export function withContentPolicy(headers: Record<string, string | string[]> | undefined): Record<string, string[]> {
  const out: Record<string, string[]> = {}
  for (const [name, value] of Object.entries(headers ?? {})) {
    if (name.toLowerCase() === 'content-security-policy') continue
    out[name] = Array.isArray(value) ? value : [value]
  }
  out['Content-Security-Policy'] = [contentPolicyText()]
  return out
}
