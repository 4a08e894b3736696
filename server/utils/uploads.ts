import { createHash, randomUUID } from 'node:crypto'
import type { H3Event } from 'h3'
import type { Actor } from './auth'
import type { DbOrTx } from './db'

// Certificates and photos. The bytes go to the 'uploads' storage mount (nuxt.config nitro.storage:
// local disk under .data/uploads by default) under a generated key; the file's own name is only shown.

export const UPLOAD_TYPES = {
  'application/pdf': { label: 'PDF', extension: 'pdf' },
  'image/jpeg': { label: 'JPEG photo', extension: 'jpg' },
  'image/png': { label: 'PNG image', extension: 'png' },
} as const
export type UploadType = keyof typeof UPLOAD_TYPES

const DEFAULT_MAX_BYTES = 10 * 1024 * 1024
/** Room for the multipart boundaries and headers around the file itself. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024

export function uploadMaxBytes(): number {
  const configured = Number((useRuntimeConfig().uploads as { maxBytes?: number } | undefined)?.maxBytes)
  return Number.isFinite(configured) && configured > 0 ? configured : DEFAULT_MAX_BYTES
}

/** Room per site (NUXT_UPLOADS_SITE_QUOTA_MB, 2048 by default) and uploads per person per hour (NUXT_UPLOADS_PER_USER_PER_HOUR, 60). */
export function uploadLimits() {
  const config = (useRuntimeConfig().uploads ?? {}) as { siteQuotaMb?: unknown, perUserPerHour?: unknown }
  const quotaMb = Number(config.siteQuotaMb)
  const perHour = Number(config.perUserPerHour)
  return {
    siteQuotaBytes: Math.floor((Number.isFinite(quotaMb) && quotaMb > 0 ? quotaMb : 2048) * 1024 * 1024),
    perUserPerHour: Number.isInteger(perHour) && perHour > 0 ? perHour : 60,
  }
}

const rateRefusal = (perHour: number) => codedError(429, 'uploads_too_many', `You have uploaded ${perHour} files in the last hour, the most allowed. Try again later.`, { params: { n: perHour } })

async function uploadsThisHour(db: DbOrTx, userId: string): Promise<number> {
  const [row] = await db.select({ n: count() }).from(tables.uploads)
    .where(and(eq(tables.uploads.userId, userId), gte(tables.uploads.createdAt, sql`now() - interval '1 hour'`)))
  return Number(row?.n ?? 0)
}

/** Before the body is read: a person over their hourly number of uploads gets 429 at once. */
export async function refuseUploadRate(actor: Actor) {
  const { perUserPerHour } = uploadLimits()
  if (await uploadsThisHour(useDb(), actor.user.id) >= perUserPerHour) throw rateRefusal(perUserPerHour)
}

// The type from the file's first bytes (magic numbers), never from its name or the browser's claim.
export function sniffUploadType(bytes: Uint8Array): UploadType | null {
  const starts = (sig: number[]) => sig.every((b, i) => bytes[i] === b)
  if (starts([0x25, 0x50, 0x44, 0x46, 0x2D])) return 'application/pdf' // %PDF-
  if (starts([0xFF, 0xD8, 0xFF])) return 'image/jpeg'
  if (starts([0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A])) return 'image/png'
  return null
}

// A file name that tries to be a path (separators, '..', control characters) is refused outright.
export function hostileFileName(name: string): boolean {
  // eslint-disable-next-line no-control-regex
  return /[/\\]/.test(name) || name.includes('..') || /[\u0000-\u001F\u007F]/.test(name)
}

// What is shown as the file's name: letters, digits and a few marks, at most 100 characters,
// with the extension that matches its real type.
export function sanitizeDisplayName(name: string, type: UploadType): string {
  const extension = UPLOAD_TYPES[type].extension
  const stem = name.normalize('NFKC').replace(/\.[^.]*$/, '')
    .replace(/[^\p{L}\p{N} ._()-]+/gu, '_').replace(/\s+/g, ' ').replace(/^[ ._-]+|[ ._-]+$/g, '').slice(0, 96)
  return `${stem || 'upload'}.${extension}`
}

// Refuses a body that announces itself as too big before any of it is read.
export function refuseOversizedRequest(event: H3Event) {
  const declared = Number(getRequestHeader(event, 'content-length'))
  const max = uploadMaxBytes()
  if (Number.isFinite(declared) && declared > max + MULTIPART_OVERHEAD_BYTES) {
    throw codedError(413, 'file_too_large', `The file is larger than ${Math.round(max / 1024 / 1024)} MB.`, { params: { mb: Math.round(max / 1024 / 1024) } })
  }
}

export interface CheckedFile {
  bytes: Buffer
  type: UploadType
  displayName: string
}

// The one file in a multipart body under `field`, checked for size, type and name.
export async function readUploadedFile(event: H3Event, field = 'file'): Promise<CheckedFile> {
  refuseOversizedRequest(event)
  const contentType = getRequestHeader(event, 'content-type') ?? ''
  if (!contentType.startsWith('multipart/form-data')) {
    throw codedError(415, 'upload_unreadable', 'Send the file as multipart/form-data.')
  }
  let parts: Awaited<ReturnType<typeof readMultipartFormData>>
  try {
    parts = await readMultipartFormData(event)
  }
  catch {
    throw codedError(400, 'upload_unreadable', 'The upload could not be read. Try again.')
  }
  const files = (parts ?? []).filter(p => p.name === field && p.filename !== undefined)
  if (files.length !== 1) throw codedError(400, 'attach_one_file', 'Attach one file.', { fields: [field] })
  const file = files[0]!
  const max = uploadMaxBytes()
  if (file.data.length === 0) throw codedError(400, 'file_empty', 'The file is empty.', { fields: [field] })
  if (file.data.length > max) throw codedError(413, 'file_too_large', `The file is larger than ${Math.round(max / 1024 / 1024)} MB.`, { params: { mb: Math.round(max / 1024 / 1024) } })
  const name = file.filename ?? ''
  if (hostileFileName(name)) {
    throw codedError(400, 'file_name_not_allowed', 'The file name is not allowed. Rename the file (no slashes or "..") and try again.', { fields: { [field]: 'File name not allowed.' } })
  }
  const type = sniffUploadType(file.data)
  if (!type) {
    throw codedError(415, 'file_type_not_allowed', 'Only PDF, JPEG or PNG files are accepted.', { fields: { [field]: 'PDF, JPEG or PNG only.' } })
  }
  return { bytes: file.data, type, displayName: sanitizeDisplayName(name, type) }
}

// Checks the site's room and the person's hourly number under a per-site lock (so parallel uploads cannot
// pass together), then writes the row (with an audit entry) and the bytes in one transaction: over a limit
// (413 room, 429 rate) nothing is stored; bytes whose row did not commit are removed again.
export async function storeUpload(actor: Actor, siteId: string, file: CheckedFile) {
  const storageKey = `${siteId}:${randomUUID()}`
  const storage = useStorage('uploads')
  const { siteQuotaBytes, perUserPerHour } = uploadLimits()
  let written = false
  try {
    return await useDb().transaction(async (tx) => {
      await tx.execute(sql`SELECT pg_advisory_xact_lock(hashtextextended(${`uploads:${siteId}`}, 7302))`)
      const [used] = await tx.select({ bytes: sql<number>`coalesce(sum(${tables.uploads.bytes}), 0)`.mapWith(Number) }).from(tables.uploads).where(eq(tables.uploads.siteId, siteId))
      if ((used?.bytes ?? 0) + file.bytes.length > siteQuotaBytes) {
        throw codedError(413, 'site_files_full', `This site's room for files (${Math.round(siteQuotaBytes / 1024 / 1024)} MB) is full. Ask an admin to make room; nothing was stored.`, { params: { mb: Math.round(siteQuotaBytes / 1024 / 1024) } })
      }
      if (await uploadsThisHour(tx, actor.user.id) >= perUserPerHour) throw rateRefusal(perUserPerHour)
      const [row] = await tx.insert(tables.uploads).values({
        siteId, userId: actor.user.id, storageKey, contentType: file.type, bytes: file.bytes.length,
        sha256: createHash('sha256').update(file.bytes).digest('hex'), displayName: file.displayName,
      }).returning()
      await writeAudit(tx, { actor, siteId, action: 'create', entity: 'upload', entityId: row!.id, after: { displayName: row!.displayName, contentType: row!.contentType, bytes: row!.bytes } })
      written = true
      await storage.setItemRaw(storageKey, file.bytes)
      return row!
    })
  }
  catch (error) {
    if (written) await storage.removeItem(storageKey).catch(() => {})
    throw error
  }
}

export type UploadRow = typeof tables.uploads.$inferSelect

export function publicUpload(row: UploadRow) {
  return { id: row.id, siteId: row.siteId, contentType: row.contentType, bytes: row.bytes, displayName: row.displayName, createdAt: row.createdAt }
}

// An upload at one of the actor's sites; anything else is 404.
export async function findUploadForActor(event: H3Event, id: string): Promise<{ actor: Actor, upload: UploadRow }> {
  const actor = await requireActor(event)
  if (actor.siteIds.length === 0) throw codedError(404, 'no_such_file', 'No such file.')
  const [upload] = await useDb().select().from(tables.uploads)
    .where(and(eq(tables.uploads.id, id), inArray(tables.uploads.siteId, actor.siteIds)))
  if (!upload) throw codedError(404, 'no_such_file', 'No such file.')
  return { actor, upload }
}

/** A stored file's bytes as a Buffer (the disk driver answers a Buffer, the S3 driver an ArrayBuffer), or null. */
export async function readStoredFile(key: string): Promise<Buffer | null> {
  const raw = await useStorage('uploads').getItemRaw<Uint8Array | ArrayBuffer>(key)
  if (!raw) return null
  return Buffer.isBuffer(raw) ? raw : Buffer.from(raw instanceof ArrayBuffer ? new Uint8Array(raw) : raw)
}
