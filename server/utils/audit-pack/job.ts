import type { Sql } from 'postgres'
import { CoTwaGrouper, StandingTally, cellNumber, coTwaVerdict, type AuditPackStamp, type CoTwaRow } from '#shared/utils/audit-pack'
import type { Language } from '#shared/utils/languages'
import { mailWords, type MailT } from '../mail-words'
import type { AuditPdf } from './pdf'
import { CO_TWA_TABLE, PACK_SECTIONS, packCoReadings, packEmissionsTests, type PackColumn, type PackColumnKey, type PackTable } from './sections'
import { CORRECTION_CSV_FIELDS, correctionCsvCells, type PackCorrectableRow } from './sql'
import { PackZip, certificateFileName } from './zip'
import { keptDateFormat } from '#shared/utils/intl-formats'

// The audit-pack job: each section's tables are read through a cursor a batch at a time and written to
// the PDF and to their CSV in the ZIP as they come; the certificates go in last, one file at a time.
// The PDF is the job's file (jobs:<id>), the ZIP sits beside it (jobs:<id>-zip).

export interface AuditPackInput {
  siteId: string
  from: string
  to: string
  siteName: string
  timeZone: string
  siteLimitPpm: number
  madeBy: string
  /** the language of the person who asked; the pack's own words are written in it (records stay as written) */
  language?: Language
}

export interface AuditPackResult { pages: number, bytes: number, zipBytes: number, certificates: number, counts: Record<string, number> }

// rows per cursor fetch; between batches the job lets the server's other requests run
const BATCH = 250

export const auditZipKey = (jobId: string) => `jobs:${jobId}-zip`
export const readAuditZip = (jobId: string) => readStoredFile(auditZipKey(jobId))

/** "2026-12-02 10:15" in the site's time. */
export function siteClock(at: Date, timeZone: string): string {
  return keptDateFormat('sv-SE', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit' }).format(at)
}

/** A batch of rows as CSV text (through csvText, like every CSV Bayward sends); the header only on the first. */
function csvChunk(fields: readonly string[], rows: unknown[][], first: boolean): string {
  const text = csvText(fields, rows)
  if (first) return `${text}\r\n`
  const body = text.slice(text.indexOf('\r\n') + 2)
  return rows.length ? `${body}\r\n` : ''
}

/** A table's columns in the reader's words. */
const columnsIn = (t: MailT, columns: PackColumnKey[]): PackColumn[] => columns.map(c => ({ label: t(`audit_pack.pdf.col.${c.key}`), width: c.width }))

export const auditPackJob = defineJob('audit-pack', async (input: AuditPackInput, run): Promise<AuditPackResult> => {
  const t = mailWords(input.language)
  const stamp: AuditPackStamp = { siteName: input.siteName, from: input.from, to: input.to, madeAt: siteClock(new Date(), input.timeZone), madeBy: input.madeBy }
  // (the PDF writer and pdf-lib come with the first pack rather than at server start)
  const pdf = await (await import('./pdf')).AuditPdf.create(stamp, t)
  const zip = new PackZip()
  // the pool's own client, for its cursors (drizzle has none)
  const client = (useDb() as unknown as { $client: Sql }).$client
  const certificates: { key: string, name: string }[] = []
  const counts: Record<string, number> = {}

  const sectionTitle = (key: string) => t(`audit_pack.pdf.section.${key}`)
  pdf.heading(t('audit_pack.pdf.heading'))
  pdf.paragraph(t('audit_pack.pdf.range', { site: input.siteName, from: input.from, to: input.to, tz: input.timeZone }))
  pdf.paragraph(t('audit_pack.pdf.sections', { list: PACK_SECTIONS.map((s, i) => `${i + 1}. ${sectionTitle(s.key)}`).join('; ') }))
  pdf.paragraph(t('audit_pack.pdf.never_changed'))
  pdf.paragraph(t('floor.aid'))

  // Streams one table's rows to the PDF and its CSV; answers how many records stand.
  async function writeTable(table: PackTable, onRow?: (r: Record<string, unknown>) => void): Promise<number> {
    const tally = new StandingTally()
    const columns = columnsIn(t, table.columns)
    const fields = table.corrections ? [...columns.map(c => c.label), ...CORRECTION_CSV_FIELDS] : ['record_id', ...columns.map(c => c.label)]
    const csv = zip.textFile(table.file)
    csv.push(csvChunk(fields, [], true))
    pdf.table(t(`audit_pack.pdf.table.${table.title}`), columns)
    const params = [input.siteId, input.from, input.to, ...(table.sql.includes('$4') ? [input.timeZone] : [])]
    for await (const batch of client.unsafe(table.sql, params).cursor(BATCH)) {
      const rows: unknown[][] = []
      for (const r of batch) {
        const cells = table.cells(r, t)
        const record = r as unknown as PackCorrectableRow
        pdf.row(cells, table.corrections && !!record.correctedById)
        if (table.corrections) tally.add(record)
        else tally.standing++
        rows.push(table.corrections ? [...cells, ...correctionCsvCells(record)] : [record.id, ...cells])
        onRow?.(r)
      }
      csv.push(csvChunk(fields, rows, false))
      await new Promise(resolve => setImmediate(resolve))
    }
    csv.end()
    const rows = tally.standing + tally.replaced
    if (rows === 0) pdf.after(t('audit_pack.pdf.no_records'))
    else pdf.after(t(tally.replaced ? 'audit_pack.pdf.counted_replaced' : 'audit_pack.pdf.counted', { n: tally.standing, replaced: tally.replaced }))
    counts[table.file.replace(/\.csv$/, '')] = tally.standing
    return tally.standing
  }

  for (const [i, section] of PACK_SECTIONS.entries()) {
    pdf.heading(`${i + 1}. ${sectionTitle(section.key)}`)
    for (const line of section.intro) pdf.paragraph(t(`audit_pack.pdf.intro.${line}`))
    const twa = new CoTwaGrouper(input.siteLimitPpm)
    const twaRows: CoTwaRow[] = []
    for (const table of section.tables) {
      await writeTable(table, (r) => {
        if (table === packEmissionsTests && r.certificateKey && !r.correctedById) certificates.push({ key: String(r.certificateKey), name: certificateFileName(String(r.testedOn), String(r.truck), String(r.certificate)) })
        if (table === packCoReadings) {
          const closed = twa.push(String(r.area), String(r.day), r.correctedById ? null : { ppm: Number(r.ppm), hours: Number(r.hours) })
          if (closed) twaRows.push(closed)
        }
      })
    }
    if (section.key === 'co') {
      const last = twa.flush()
      if (last) twaRows.push(last)
      writeTwaTable(pdf, zip, twaRows, t)
    }
    await run.progress(i + 1)
  }

  for (const c of certificates) {
    const bytes = await readStoredFile(c.key)
    if (bytes) zip.storedFile(c.name, bytes)
  }
  const pdfBytes = await pdf.save()
  const zipBytes = zip.finish()
  await saveJobFile(run.jobId, pdfBytes)
  await useStorage('uploads').setItemRaw(auditZipKey(run.jobId), zipBytes)
  return { pages: pdf.pageCount, bytes: pdfBytes.byteLength, zipBytes: zipBytes.byteLength, certificates: certificates.length, counts }
})

function writeTwaTable(pdf: AuditPdf, zip: PackZip, rows: CoTwaRow[], t: MailT) {
  const cells = (r: CoTwaRow) => [r.day, r.area, String(r.readings), cellNumber(r.sampledHours), cellNumber(r.twaPpm, 1), cellNumber(r.peakPpm, 1), coTwaVerdict(r, t)]
  const columns = columnsIn(t, CO_TWA_TABLE.columns)
  pdf.table(t(`audit_pack.pdf.table.${CO_TWA_TABLE.title}`), columns)
  rows.sort((a, b) => a.day.localeCompare(b.day) || a.area.localeCompare(b.area))
  for (const r of rows) pdf.row(cells(r))
  const over = rows.filter(r => r.overOshaPel || r.overSiteLimit).length
  pdf.after(rows.length ? t('audit_pack.pdf.twa_after', { n: rows.length, over }) : t('audit_pack.pdf.no_readings'))
  const csv = zip.textFile(CO_TWA_TABLE.file)
  csv.push(csvChunk(columns.map(c => c.label), rows.map(cells), true))
  csv.end()
}
