import { createServer } from 'node:net'
import { mkdtempSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { startSmtpFake, type SmtpFake } from '../../scripts/smtp-fake.mjs'
import { eventually } from './due'

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

/** The token of the password link delivered to `email`: the newest one, or the n-th when asked (waits for it). */
export async function linkTokenMailedTo(fake: SmtpFake, email: string, nth?: number): Promise<string> {
  const delivered = () => fake.received.filter(m => m.to.includes(email) && /reset-password\?token=/.test(m.text))
  const mails = await eventually(async () => (delivered().length >= (nth ?? 1) ? delivered() : null))
  const token = /\/reset-password\?token=([\w-]+)/.exec(mails.at(nth ? nth - 1 : -1)!.text)?.[1]
  if (!token) throw new Error(`no password link was mailed to ${email}`)
  return token
}
