import { createServer } from 'node:net'
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { startSmtpFake, type SmtpFake } from '../../scripts/smtp-fake.mjs'

export async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer()
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as { port: number }).port
      s.close(() => resolve(port))
    })
  })
}

/**
 * An SMTP fake in this test process on a free port, with the environment set so the server that setup()
 * starts next delivers to it: what was actually sent, as opposed to what the outbox table keeps.
 */
export async function captureMail(): Promise<SmtpFake & { port: number }> {
  const port = await freePort()
  const dir = mkdtempSync(join(tmpdir(), 'bayward-mail-'))
  const fake = await startSmtpFake({ port, dir, quiet: true })
  process.env.NUXT_SMTP_HOST = '127.0.0.1'
  process.env.NUXT_SMTP_PORT = String(port)
  return { ...fake, port }
}
