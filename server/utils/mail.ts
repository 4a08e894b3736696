import nodemailer, { type Transporter } from 'nodemailer'
import { sql } from 'drizzle-orm'
import type { Ability } from '#shared/utils/abilities'
import { MAIL_MAX_ATTEMPTS, mailRetryDelaySeconds } from '#shared/utils/mail-schedule'
import type { DbOrTx } from './db'
import type { FitReason } from '#shared/utils/battery-fit'
import type { UnitSystem } from '#shared/utils/units'
import { mailReason, mailWords, type MailT } from './mail-words'

// The outbox: every message is written to mail_messages inside the transaction of the record that
// caused it, then delivered after the response; a failed delivery is kept and tried again later.

export interface SmtpSettings {
  host: string
  port: number
  secure: boolean
  user: string
  pass: string
  from: string
}

/** SMTP from the environment (NUXT_SMTP_HOST, _PORT, _SECURE, _USER, _PASS, _FROM); a local server on 2525 by default. */
export function smtpSettings(env: NodeJS.ProcessEnv = process.env): SmtpSettings {
  return {
    host: env.NUXT_SMTP_HOST || '127.0.0.1',
    port: Number(env.NUXT_SMTP_PORT || 2525),
    secure: env.NUXT_SMTP_SECURE === 'true',
    user: env.NUXT_SMTP_USER || '',
    pass: env.NUXT_SMTP_PASS || '',
    from: env.NUXT_SMTP_FROM || 'Bayward <bayward@localhost>',
  }
}

let transport: { key: string, transporter: Transporter } | undefined

function mailTransport(settings: SmtpSettings): Transporter {
  const key = JSON.stringify(settings)
  if (transport?.key !== key) {
    transport = {
      key,
      transporter: nodemailer.createTransport({
        host: settings.host,
        port: settings.port,
        secure: settings.secure,
        auth: settings.user ? { user: settings.user, pass: settings.pass } : undefined,
        connectionTimeout: 5000,
        greetingTimeout: 5000,
        socketTimeout: 15000,
      }),
    }
  }
  return transport.transporter
}

export interface OutgoingMail {
  siteId: string | null
  to: string
  subject: string
  body: string
  kind: string
  /** sealed one-time secret the body's link slot is rendered from at send time (password links) */
  linkSecret?: string
}

export type MailRow = typeof tables.mailMessages.$inferSelect

/** Records messages in the outbox (inside the caller's transaction); delivery comes later. */
export async function queueMail(tx: DbOrTx, messages: OutgoingMail | OutgoingMail[]): Promise<MailRow[]> {
  const list = Array.isArray(messages) ? messages : [messages]
  if (list.length === 0) return []
  return tx.insert(tables.mailMessages).values(list.map(m => ({
    siteId: m.siteId, toAddress: m.to, subject: m.subject.slice(0, 300), body: m.body, kind: m.kind, linkSecret: m.linkSecret ?? null,
  }))).returning()
}

/** Active people at a site who hold the ability (who is told), with their e-mail. */
export async function peopleWhoHold(tx: DbOrTx, siteId: string, ability: Ability) {
  const roles = rolesWith(ability)
  if (roles.length === 0) return []
  return tx.selectDistinct({ id: tables.users.id, email: tables.users.email, name: tables.users.name, language: tables.users.language })
    .from(tables.memberships).innerJoin(tables.users, eq(tables.users.id, tables.memberships.userId))
    .where(and(eq(tables.memberships.siteId, siteId), inArray(tables.memberships.role, [...roles]), eq(tables.users.active, true)))
}

/** An alert's words: fixed text, or written per recipient in their language (mail-words.ts). */
export type AlertText = string | ((t: MailT, units: UnitSystem) => string)

export interface AlertInput {
  siteId: string
  kind: string
  subject: AlertText
  body: AlertText
  /** who gets it: everyone at the site who holds this notice in the permissions map */
  audience: Ability
  /** and these people too (a follow-up owner) */
  userIds?: readonly string[]
}

export function appLink(path: string): string {
  const base = (useRuntimeConfig().public.baseUrl as string | undefined) || 'http://localhost:3000'
  return new URL(path, base).toString()
}

// An immediate alert: one outbox message per recipient, in the caller's transaction, in each recipient's language.
export async function queueAlert(tx: DbOrTx, alert: AlertInput): Promise<MailRow[]> {
  const people = await peopleWhoHold(tx, alert.siteId, alert.audience)
  const extra = alert.userIds?.length
    ? await tx.select({ id: tables.users.id, email: tables.users.email, name: tables.users.name, language: tables.users.language }).from(tables.users)
        .where(and(inArray(tables.users.id, [...alert.userIds]), eq(tables.users.active, true)))
    : []
  const [place] = await tx.select({ unitSystem: tables.sites.unitSystem }).from(tables.sites).where(eq(tables.sites.id, alert.siteId))
  const units = place?.unitSystem ?? 'us'
  const to = new Map([...people, ...extra].map(p => [p.email.toLowerCase(), p]))
  return queueMail(tx, [...to.values()].map((p) => {
    const t = mailWords(p.language, { days: true })
    const say = (text: AlertText) => (typeof text === 'string' ? text : text(t, units))
    return {
      siteId: alert.siteId, to: p.email, kind: alert.kind, subject: `[Bayward] ${say(alert.subject)}`,
      body: `${t('mail.hello', { name: p.name.split(' ')[0]! })}\n\n${say(alert.body)}\n\n— Bayward`,
    }
  }))
}

// Alerts the fuel-station routes raise; call inside the transaction that stores the record, then
// deliverMailSoon() after it commits.
export function notifyFailedEmissionsTest(tx: DbOrTx, a: { siteId: string, truckId: string, fleetNumber: string, testedOn: string, reasons: FitReason[], retestBy: string }) {
  return queueAlert(tx, {
    siteId: a.siteId, kind: 'alert:emissions_failed', audience: 'notice.emissions-failed',
    subject: t => t('mail.emissions_failed_subject', { truck: a.fleetNumber }),
    body: (t, units) => [t('mail.emissions_failed', { truck: a.fleetNumber, on: a.testedOn }), ...a.reasons.map(r => mailReason(t, r, units)), t('mail.retest_by', { on: a.retestBy }), '', appLink(`/emissions?truck=${a.truckId}`)].join('\n'),
  })
}

export function notifyRefusedCylinder(tx: DbOrTx, a: { siteId: string, cylinderId: string, code: string, reasons: FitReason[], by: string }) {
  return queueAlert(tx, {
    siteId: a.siteId, kind: 'alert:cylinder_refused', audience: 'notice.cylinder-refused',
    subject: t => t('mail.cylinder_refused_subject', { cylinder: a.code }),
    body: (t, units) => [t('mail.cylinder_refused', { who: a.by, cylinder: a.code }), ...a.reasons.map(r => mailReason(t, r, units)), '', appLink(`/cylinders/${a.cylinderId}`)].join('\n'),
  })
}

export function notifyCoAboveCeiling(tx: DbOrTx, a: { siteId: string, areaId: string, areaName: string, takenOn: string, peakPpm: number, ceilingPpm: number }) {
  return queueAlert(tx, {
    siteId: a.siteId, kind: 'alert:co_ceiling', audience: 'notice.co-ceiling',
    subject: t => t('mail.co_ceiling_subject', { ceiling: a.ceilingPpm, area: a.areaName }),
    body: t => `${t('mail.co_ceiling', { peak: a.peakPpm, area: a.areaName, on: a.takenOn, ceiling: a.ceilingPpm })}\n\n${appLink(`/co?area=${a.areaId}`)}`,
  })
}

let deliveryTimer: ReturnType<typeof setTimeout> | undefined

/** Delivers the outbox shortly, after the current response; never throws into the request. */
export function deliverMailSoon() {
  if (deliveryTimer) return
  deliveryTimer = setTimeout(() => {
    deliveryTimer = undefined
    deliverDueMail().catch(error => console.error('mail delivery failed', error))
  }, 10)
  deliveryTimer.unref?.()
}

export interface DeliveryResult { attempted: number, sent: number, failed: number }
export interface ClaimedMail { id: string, toAddress: string, subject: string, body: string, attempts: number, linkSecret: string | null, createdAt: Date | string }

// Claims due messages (skipping those another server holds), sends each, and records the outcome.
// `force` also takes failed messages whose next try is later, and those past the last attempt.
export async function deliverDueMail({ force = false, siteId, limit = 50 }: { force?: boolean, siteId?: string, limit?: number } = {}): Promise<DeliveryResult> {
  const db = useDb()
  const claimed = await db.execute(sql`
    UPDATE mail_messages SET next_attempt_at = now() + interval '2 minutes', updated_at = now()
    WHERE id IN (
      SELECT id FROM mail_messages
      WHERE status IN ('queued', 'failed')
        ${force ? sql`` : sql`AND next_attempt_at <= now() AND attempts < ${MAIL_MAX_ATTEMPTS}::int`}
        ${siteId ? sql`AND site_id = ${siteId}` : sql``}
      ORDER BY created_at LIMIT ${limit}::int FOR UPDATE SKIP LOCKED
    )
    RETURNING id, to_address AS "toAddress", subject, body, attempts, link_secret AS "linkSecret", created_at AS "createdAt"`) as unknown as ClaimedMail[]
  const settings = smtpSettings()
  const result: DeliveryResult = { attempted: claimed.length, sent: 0, failed: 0 }
  for (const m of claimed) {
    const attempts = m.attempts + 1
    // a password link is rendered from its one-time secret now; once sent (or given up) the secret is dropped
    const text = m.linkSecret ? renderPasswordLinkMail(m) : m.body
    if (text === null) {
      await db.update(tables.mailMessages).set({ status: 'failed', attempts: MAIL_MAX_ATTEMPTS, linkSecret: null, lastError: 'The link expired before it could be sent; ask for a new one.' }).where(eq(tables.mailMessages.id, m.id))
      result.failed += 1
      continue
    }
    try {
      await mailTransport(settings).sendMail({ from: settings.from, to: m.toAddress, subject: m.subject, text })
      await db.update(tables.mailMessages).set({ status: 'sent', attempts, sentAt: new Date(), lastError: null, linkSecret: null }).where(eq(tables.mailMessages.id, m.id))
      result.sent += 1
    }
    catch (error) {
      const delay = mailRetryDelaySeconds(attempts)
      await db.update(tables.mailMessages).set({
        status: 'failed', attempts, lastError: String((error as Error)?.message ?? error).slice(0, 500),
        nextAttemptAt: new Date(Date.now() + (delay ?? 365 * 86_400) * 1000),
        ...(delay === null ? { linkSecret: null } : {}),
      }).where(eq(tables.mailMessages.id, m.id))
      result.failed += 1
    }
  }
  return result
}
