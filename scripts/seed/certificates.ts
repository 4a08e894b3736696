import { createHash } from 'node:crypto'
import { PDFDocument, StandardFonts, rgb } from 'pdf-lib'
import { createStorage, type Storage } from 'unstorage'
import fsDriver from 'unstorage/drivers/fs'
import s3Driver from 'unstorage/drivers/s3'
import type { SeedContext } from './context'

// The tester's certificate of each demo emissions test: a one-page PDF in an invented tester's layout, kept
// as an upload row whose bytes go to the same storage the server uses (disk under .data/uploads, or the S3
// bucket of NUXT_UPLOADS_DRIVER=s3), so the emissions page links it and the audit pack carries it.

const TESTING_FIRM = 'Brennock Engine Testing (invented for the demo)'

export interface EmissionsCertificate {
  siteId: string
  siteName: string
  userId: string
  truck: string
  fuel: string
  testedOn: string
  at: Date
  tester: string
  readings: { coIdlePct: number, coHighIdlePct: number, hcPpm: number, co2Pct: number, o2Pct: number, idleRpm: number, highIdleRpm: number }
  passed: boolean
  reasons: readonly string[]
}

/** An id made from the record's own, so the demo's other ids stay as they were and a re-seed writes the same keys. */
function derivedId(of: string): string {
  const h = createHash('sha256').update(`certificate:${of}`).digest('hex')
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-8${h.slice(17, 20)}-${h.slice(20, 32)}`
}

/** Draws the certificate of record `recordId`, adds its upload row and queues its bytes (ctx.files); returns the upload's id. */
export async function emissionsCertificate(ctx: SeedContext, recordId: string, c: EmissionsCertificate): Promise<string> {
  const doc = await PDFDocument.create()
  doc.setTitle(`Exhaust emissions test ${c.truck} ${c.testedOn}`)
  doc.setAuthor(c.tester)
  doc.setCreator(TESTING_FIRM)
  doc.setCreationDate(c.at)
  doc.setModificationDate(c.at)
  const page = doc.addPage([612, 792])
  const regular = await doc.embedFont(StandardFonts.Helvetica)
  const bold = await doc.embedFont(StandardFonts.HelveticaBold)
  let y = 730
  const line = (text: string, size = 11, font = regular, x = 56) => {
    page.drawText(text, { x, y, size, font, color: rgb(0.1, 0.1, 0.15) })
    y -= size + 9
  }
  line(TESTING_FIRM, 10)
  y -= 6
  line('Exhaust emissions test certificate', 20, bold)
  y -= 8
  line(`Customer site: ${c.siteName}`)
  line(`Truck: ${c.truck} (${c.fuel === 'gasoline' ? 'gasoline' : 'LP-gas'})`)
  line(`Tested on: ${c.testedOn}    Tester: ${c.tester}`)
  y -= 10
  line('Readings (four-gas analyser, engine warm)', 12, bold)
  const r = c.readings
  const rows: Array<[string, string]> = [
    ['CO at idle', `${r.coIdlePct.toFixed(2)} %  at ${r.idleRpm} rpm`],
    ['CO at high idle', `${r.coHighIdlePct.toFixed(2)} %  at ${r.highIdleRpm} rpm`],
    ['HC', `${r.hcPpm} ppm`],
    ['CO2', `${r.co2Pct.toFixed(1)} %`],
    ['O2', `${r.o2Pct.toFixed(1)} %`],
  ]
  for (const [name, value] of rows) {
    page.drawText(name, { x: 72, y, size: 11, font: regular })
    page.drawText(value, { x: 220, y, size: 11, font: regular })
    y -= 20
  }
  y -= 10
  line(`Result: ${c.passed ? 'PASS' : 'FAIL'}`, 16, bold)
  for (const reason of c.reasons) line(reason, 10)
  y -= 20
  line('Signed for the testing firm:', 10)
  line(c.tester, 12, bold)
  page.drawText('A sample document made for the Bayward demonstration data; no real test took place.', { x: 56, y: 48, size: 8, font: regular, color: rgb(0.4, 0.4, 0.45) })
  const bytes = await doc.save()

  const id = derivedId(recordId)
  const storageKey = `${c.siteId}:${id}`
  ctx.rows.uploads.push({
    id, siteId: c.siteId, userId: c.userId, storageKey, contentType: 'application/pdf', bytes: bytes.length,
    sha256: createHash('sha256').update(bytes).digest('hex'), displayName: `emissions-${c.truck}-${c.testedOn}.pdf`, createdAt: c.at,
  })
  ctx.files.push({ key: storageKey, bytes })
  return id
}

/** The uploads storage as the server mounts it (server/plugins/storage.ts), from the same environment. */
export function seedStorage(env = process.env): Storage {
  if (env.NUXT_UPLOADS_DRIVER === 's3') {
    return createStorage({
      driver: s3Driver({
        endpoint: env.NUXT_UPLOADS_S3_ENDPOINT ?? '', region: env.NUXT_UPLOADS_S3_REGION ?? 'auto', bucket: env.NUXT_UPLOADS_S3_BUCKET ?? '',
        accessKeyId: env.NUXT_UPLOADS_S3_ACCESS_KEY_ID ?? '', secretAccessKey: env.NUXT_UPLOADS_S3_SECRET_ACCESS_KEY ?? '',
      }),
    })
  }
  return createStorage({ driver: fsDriver({ base: './.data/uploads' }) })
}

/** Writes the queued files (after the rows that name them have committed). */
export async function writeSeedFiles(ctx: SeedContext, storage = seedStorage()) {
  for (const f of ctx.files) await storage.setItemRaw(f.key, f.bytes)
  return ctx.files.length
}
