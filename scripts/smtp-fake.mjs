// A local SMTP server standing in for the real one: it accepts every message and writes it to
// <dir>/<timestamp>-<n>.eml so a developer can read what Bayward sent.
// Usage: node scripts/smtp-fake.mjs   (BAYWARD_SMTP_FAKE_PORT, default 2525; BAYWARD_SMTP_CAPTURE_DIR, default .data/mail)
import { mkdirSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import { SMTPServer } from 'smtp-server'

let sequence = 0

// RFC 2047 encoded words (=?UTF-8?Q?…?= and =?UTF-8?B?…?=) in a header, as plain text.
function decodeHeader(value) {
  return value.replace(/=\?([\w-]+)\?([QB])\?([^?]*)\?=\s*/gi, (_m, _charset, encoding, text) => encoding.toUpperCase() === 'B'
    ? Buffer.from(text, 'base64').toString('utf8')
    : Buffer.from(text.replace(/_/g, ' ').replace(/=([0-9A-F]{2})/gi, (_x, hex) => String.fromCharCode(Number.parseInt(hex, 16))), 'latin1').toString('utf8'))
}

// The body as text: quoted-printable soft breaks and escapes undone.
function decodeBody(raw) {
  const split = raw.indexOf('\r\n\r\n')
  const head = raw.slice(0, split)
  const body = raw.slice(split + 4)
  if (!/content-transfer-encoding:\s*quoted-printable/i.test(head)) return body
  return Buffer.from(body.replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/gi, (_x, hex) => String.fromCharCode(Number.parseInt(hex, 16))), 'latin1').toString('utf8')
}

/** Starts the fake on host:port (port 0 picks a free one); resolves with its port, the messages it got, and stop(). */
export async function startSmtpFake({ port = 2525, host = '127.0.0.1', dir = '.data/mail', quiet = false } = {}) {
  const folder = resolve(dir)
  mkdirSync(folder, { recursive: true })
  const received = []
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onAuth(auth, _session, callback) {
      callback(null, { user: auth.username })
    },
    onData(stream, session, callback) {
      const chunks = []
      stream.on('data', chunk => chunks.push(chunk))
      stream.on('end', () => {
        const raw = Buffer.concat(chunks).toString('utf8')
        sequence += 1
        const file = join(folder, `${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}-${sequence}.eml`)
        writeFileSync(file, raw)
        const subject = decodeHeader(/^Subject: (.*(?:\r?\n[ \t].*)*)/im.exec(raw)?.[1]?.replace(/\r?\n[ \t]/g, ' ') ?? '')
        const message = { file, raw, text: decodeBody(raw), subject, from: session.envelope.mailFrom?.address ?? '', to: session.envelope.rcptTo.map(r => r.address) }
        received.push(message)
        if (!quiet) console.log(`smtp-fake: ${message.to.join(', ')} · ${subject} → ${file}`)
        callback()
      })
    },
  })
  await new Promise((resolvePromise, reject) => {
    server.once('error', reject)
    server.listen(port, host, () => resolvePromise(undefined))
  })
  const address = server.server.address()
  return {
    port: typeof address === 'object' && address ? address.port : port,
    dir: folder,
    received,
    stop: () => new Promise(resolvePromise => server.close(() => resolvePromise(undefined))),
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const fake = await startSmtpFake({
    port: Number(process.env.BAYWARD_SMTP_FAKE_PORT ?? 2525),
    dir: process.env.BAYWARD_SMTP_CAPTURE_DIR ?? '.data/mail',
  })
  console.log(`smtp-fake: listening on 127.0.0.1:${fake.port}, writing to ${fake.dir}`)
  const stop = () => fake.stop().then(() => process.exit(0))
  process.on('SIGTERM', stop)
  process.on('SIGINT', stop)
}
