import { describe, expect, it } from 'vitest'
import { baseUrl, Client } from '../support/api'
import { createTestNewsroom } from '../support/newsroom'
import { expectStatus, uploadPayments, writeStory } from '../support/stories'

// The headers and values are the ones the OWASP Secure Headers Project recommends and MDN
// documents (Content-Security-Policy Level 3, X-Frame-Options, X-Content-Type-Options,
// Referrer-Policy, Permissions-Policy, Cross-Origin-Opener-Policy), as remembered from them.

/** A page as a browser asks for it, signed in as `client` when given. */
async function fetchPage(path: string, client?: Client) {
  const response = await fetch(`${baseUrl}${path}`, { headers: { accept: 'text/html', ...(client ? { cookie: client.cookie } : {}) }, redirect: 'manual' })
  return { status: response.status, headers: response.headers, html: await response.text() }
}

/** The directives of a Content-Security-Policy header, by name. */
function directives(header: string | null): Record<string, string[]> {
  expect(header, 'Content-Security-Policy header').toBeTruthy()
  return Object.fromEntries(header!.split(';').map(d => d.trim().split(/\s+/)).filter(d => d[0]).map(([name, ...sources]) => [name!, sources]))
}

/** The headers every reply carries, whatever it holds. */
function expectHardened(headers: Headers) {
  const csp = directives(headers.get('content-security-policy'))
  expect(csp['frame-ancestors']).toEqual(['\'none\''])
  expect(headers.get('x-frame-options')).toBe('DENY')
  expect(headers.get('x-content-type-options')).toBe('nosniff')
  expect(headers.get('cross-origin-opener-policy')).toBe('same-origin')
  expect(headers.get('permissions-policy')).toMatch(/camera=\(\)/)
  // Neither value ever sends a page's path (and a public link's token) to another site (MDN, Referrer-Policy).
  expect(['same-origin', 'no-referrer']).toContain(headers.get('referrer-policy'))
  return csp
}

/**
 * Checks a rendered page's policy: no string evaluation, no inline scripts by permission, and a
 * nonce that every script Nuxt wrote carries (an inline script without it would not run).
 */
function expectNoncedPage(page: { headers: Headers, html: string }) {
  const csp = expectHardened(page.headers)
  const scriptSrc = csp['script-src']!
  expect(scriptSrc).not.toContain('\'unsafe-eval\'')
  expect(scriptSrc).not.toContain('\'unsafe-inline\'')
  expect(csp['object-src']).toEqual(['\'none\''])
  const nonces = scriptSrc.filter(s => s.startsWith('\'nonce-')).map(s => s.slice(7, -1))
  expect(nonces).toHaveLength(1)
  const tags = [...page.html.matchAll(/<script\b([^>]*)>/g)].map(m => m[1]!)
  const inline = tags.filter(attrs => !/\ssrc=/.test(attrs) && !/type="application\/json"/.test(attrs))
  expect(inline.length, 'inline scripts Nuxt renders (window.__NUXT__)').toBeGreaterThan(0)
  for (const attrs of tags) expect(attrs).toContain(`nonce="${nonces[0]}"`)
  return nonces[0]!
}

describe('security headers', () => {
  it('a page carries a nonce-based policy that matches every script it renders, fresh on each request', async () => {
    const first = await fetchPage('/login')
    expect(first.status).toBe(200)
    const second = await fetchPage('/login')
    expect(expectNoncedPage(first)).not.toBe(expectNoncedPage(second))
  })

  it('a page that does not exist renders its error page under the same rules', async () => {
    // Signed in: without a session the error page sends the visitor to sign in instead.
    const { reporter } = await createTestNewsroom('Headers desk')
    const missing = await fetchPage('/no-such-page-here', reporter)
    expect(missing.status).toBe(404)
    expectNoncedPage(missing)
  })

  it('API replies, errors included, and static files carry them too', async () => {
    const health = await fetch(`${baseUrl}/api/health`)
    expect(health.status).toBe(200)
    expectHardened(health.headers)
    const unsigned = await new Client().get('/api/me')
    expect(unsigned.status).toBe(401)
    expectHardened(unsigned.headers)
    const icon = await fetch(`${baseUrl}/mark.svg`)
    expect(icon.status).toBe(200)
    expectHardened(icon.headers)
  })

  it('the public page and its API reply carry them, and keep the link out of any other site\'s Referer', async () => {
    const newsroom = await createTestNewsroom('Headers desk')
    const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Header test.' })
    expectStatus(published, 201)
    const path = new URL(published.body.url).pathname
    const page = await fetchPage(path)
    expect(page.status).toBe(200)
    expect(page.html).toContain(story.title)
    expectNoncedPage(page)
    const reply = await new Client().get(`/api/public/${path.split('/p/')[1]}`)
    expect(reply.status).toBe(200)
    expectHardened(reply.headers)
  })

  it('only a published chart\'s embed page may be framed by another site, and it keeps every other header', async () => {
    const newsroom = await createTestNewsroom('Headers desk')
    const datasetId = await uploadPayments(newsroom.reporter, newsroom.id)
    const story = await writeStory(newsroom.reporter, newsroom.id, datasetId)
    expectStatus(await newsroom.reporter.post(`/api/blocks/${story.analysisBlockId}/run`), 200)
    const published = await newsroom['data-editor'].post(`/api/investigations/${story.id}/publish`, { reason: 'Header test.' })
    expectStatus(published, 201)
    const token = new URL(published.body.url).pathname.split('/p/')[1]
    const embed = await fetchPage(`/embed/${token}/1`)
    expect(embed.status).toBe(200)
    expect(embed.html).toContain(`href="/p/${token}"`)
    const csp = directives(embed.headers.get('content-security-policy'))
    // CSP Level 3: frame-ancestors * lets any http(s) page frame it; X-Frame-Options has no such value, so it is left out.
    expect(csp['frame-ancestors']).toEqual(['*'])
    expect(embed.headers.get('x-frame-options')).toBeNull()
    expect(csp['script-src']).not.toContain('\'unsafe-inline\'')
    expect(embed.headers.get('x-content-type-options')).toBe('nosniff')
    // The published page itself, and its data, still refuse to be framed.
    expectNoncedPage(await fetchPage(`/p/${token}`))
    expectHardened((await new Client().get(`/api/public/${token}`)).headers)
  })
})
