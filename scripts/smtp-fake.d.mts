export interface FakeMessage {
  file: string
  raw: string
  /** the body, quoted-printable undone */
  text: string
  subject: string
  from: string
  to: string[]
}

export interface SmtpFake {
  port: number
  dir: string
  received: FakeMessage[]
  stop: () => Promise<void>
}

export function startSmtpFake(options?: { port?: number, host?: string, dir?: string, quiet?: boolean }): Promise<SmtpFake>
