import { describe, expect, it } from 'vitest'
import { withFreshNonce } from '../../service-worker/nonce'

// The app shell the service worker keeps is served with a new nonce on every load.
const POLICY = (n: string) => `default-src 'self'; script-src 'self' 'nonce-${n}'; object-src 'none'`
const kept = () => new Response(
  `<html><head><script nonce="OLD+nonce==">a()</script></head><body><script nonce="OLD+nonce==" type="module" src="/_nuxt/e.js"></script><p>nonce="other"</p></body></html>`,
  { headers: { 'content-security-policy': POLICY('OLD+nonce=='), 'content-type': 'text/html;charset=utf-8', 'content-length': '190' } },
)

describe('withFreshNonce', () => {
  it('replaces the nonce in the policy and in every script the server tagged, and nothing else', async () => {
    const res = await withFreshNonce(kept())
    const nonce = /'nonce-([^']+)'/.exec(res.headers.get('content-security-policy')!)![1]!
    expect(nonce).not.toBe('OLD+nonce==')
    expect(res.headers.get('content-security-policy')).toBe(POLICY(nonce))
    const html = await res.text()
    expect(html).not.toContain('OLD+nonce==')
    expect(html.split(`nonce="${nonce}"`)).toHaveLength(3)
    expect(html).toContain('<p>nonce="other"</p>')
    expect(res.headers.get('content-length')).toBeNull()
    expect(res.headers.get('content-type')).toBe('text/html;charset=utf-8')
  })

  it('two loads never share a nonce', async () => {
    const seen = new Set<string>()
    for (let i = 0; i < 20; i++) seen.add((await withFreshNonce(kept())).headers.get('content-security-policy')!)
    expect(seen.size).toBe(20)
  })
})
