// The Scan page's first-load JavaScript as the server sends it: every script and module preload its HTML
// names, fetched over plain HTTP so the bytes counted are the bytes on the wire for each Accept-Encoding.
import { request } from 'node:http'
import { fileURLToPath } from 'node:url'

export interface ScanPageBytes {
  files: number
  raw: number
  /** bytes sent to a browser that asks `br, gzip` (browsers ask for brotli over HTTPS) */
  br: number
  /** bytes sent to a browser that asks `gzip` only (Chromium over plain HTTP, e.g. a tablet on the warehouse LAN) */
  gzip: number
  /** content-encodings the server answered with, for `br, gzip` */
  brEncodings: string[]
}

function wireBytes(href: string, encoding: string): Promise<{ bytes: number, encoding: string }> {
  return new Promise((resolve, reject) => {
    const req = request(href, { headers: { 'accept-encoding': encoding } }, (res) => {
      let bytes = 0
      res.on('data', (c: Buffer) => (bytes += c.length))
      res.on('end', () => resolve({ bytes, encoding: String(res.headers['content-encoding'] ?? 'identity') }))
    })
    req.on('error', reject)
    req.end()
  })
}

export async function scanPageBytes(base: string, cookie: string): Promise<ScanPageBytes> {
  const html = await (await fetch(`${base}/scan`, { headers: { cookie } })).text()
  const scripts = new Set<string>()
  for (const m of html.matchAll(/<script\b[^>]*\bsrc="([^"]+)"/g)) scripts.add(m[1]!)
  for (const m of html.matchAll(/<link\b[^>]*>/g)) {
    if (/rel="modulepreload"/.test(m[0])) scripts.add(/href="([^"]+)"/.exec(m[0])?.[1] ?? '')
  }
  scripts.delete('')
  const total: ScanPageBytes = { files: scripts.size, raw: 0, br: 0, gzip: 0, brEncodings: [] }
  for (const src of scripts) {
    const href = new URL(src, base).toString()
    total.raw += (await wireBytes(href, 'identity')).bytes
    const br = await wireBytes(href, 'br, gzip')
    total.br += br.bytes
    if (!total.brEncodings.includes(br.encoding)) total.brEncodings.push(br.encoding)
    total.gzip += (await wireBytes(href, 'gzip')).bytes
  }
  return total
}

// `npm run bench:scan`: the same figure against a running server (the demo by default), signed in as the
// demo operator.
if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const base = process.env.BAYWARD_BASE_URL ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`
  const res = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: process.env.BAYWARD_SCAN_EMAIL ?? 'operator@millbrook.example', password: process.env.BAYWARD_SCAN_PASSWORD ?? 'bayward-demo' }),
  })
  const cookie = res.headers.getSetCookie().map(c => c.split(';')[0]).join('; ')
  if (!res.ok) throw new Error(`sign-in answered ${res.status}`)
  const b = await scanPageBytes(base, cookie)
  console.log(`Scan page first-load JS, ${b.files} files: ${(b.raw / 1024).toFixed(1)} kB raw, ${(b.br / 1024).toFixed(1)} kB as served for "br, gzip" (${b.brEncodings.join(', ')}), ${(b.gzip / 1024).toFixed(1)} kB as served for "gzip"`)
}
