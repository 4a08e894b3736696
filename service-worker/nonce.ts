/**
 * The kept app shell with a new script nonce: every `nonce="…"` the server wrote and the nonce in its
 * Content-Security-Policy header are replaced by a fresh random one, so no two loads share a nonce and the
 * strict policy (script-src 'self' 'nonce-…') stays exactly as the server sent it otherwise.
 */
export async function withFreshNonce(kept: Response): Promise<Response> {
  const html = await kept.clone().text()
  const headers = new Headers(kept.headers)
  const policy = headers.get('content-security-policy') ?? ''
  const old = /'nonce-([^']+)'/.exec(policy)?.[1]
  if (!old) return new Response(html, { status: 200, headers })
  const nonce = btoa(String.fromCharCode(...crypto.getRandomValues(new Uint8Array(16))))
  headers.set('content-security-policy', policy.split(`'nonce-${old}'`).join(`'nonce-${nonce}'`))
  headers.delete('content-length')
  headers.set('x-bayward-shell', 'offline')
  return new Response(html.split(`nonce="${old}"`).join(`nonce="${nonce}"`), { status: 200, headers })
}
