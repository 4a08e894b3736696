import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import type { PDFDocument, PDFFont } from 'pdf-lib'
import type { AssetKind } from '#shared/utils/asset-schemas'
import type { LabelSelection } from '#shared/utils/label-schemas'

export interface LabelItem { kind: AssetKind, id: string, code: string, title: string, identity: string }

const ASSET_TABLES = () => ({
  battery: tables.batteries, charger: tables.chargers, cylinder: tables.lpCylinders, truck: tables.trucks, area: tables.areas,
}) as const

// The live tags a label sheet covers, with each asset's identity line: one query for the tags and
// one per asset kind present.
// The identity line on each label in `language` and the site's units.
export async function selectLabelItems(selection: LabelSelection, language?: string | null): Promise<LabelItem[]> {
  const db = useDb()
  const [site] = await db.select({ unitSystem: tables.sites.unitSystem }).from(tables.sites).where(eq(tables.sites.id, selection.siteId))
  const say = mailWords(language)
  const where = [eq(tables.tags.siteId, selection.siteId), isNull(tables.tags.retiredAt)]
  if (selection.kind) where.push(eq(tables.tags.assetKind, selection.kind))
  if (selection.ids?.length) where.push(inArray(tables.tags.assetId, selection.ids))
  if (selection.unprinted) where.push(isNull(tables.tags.printedAt))
  const tags = await db.select().from(tables.tags).where(and(...where)).orderBy(asc(tables.tags.code))
  const byKind = new Map<AssetKind, string[]>()
  for (const t of tags) byKind.set(t.assetKind, [...(byKind.get(t.assetKind) ?? []), t.assetId])
  const rows = new Map<string, Record<string, unknown>>()
  for (const [kind, ids] of byKind) {
    const table = ASSET_TABLES()[kind]
    for (const row of await db.select().from(table).where(inArray(table.id, ids))) rows.set(row.id, row)
  }
  return tags.filter(t => rows.has(t.assetId)).map((t) => {
    const row = rows.get(t.assetId)!
    return { kind: t.assetKind, id: t.assetId, code: t.code, title: assetTitle(t.assetKind, row), identity: assetIdentityIn(t.assetKind, row, say, site?.unitSystem === 'metric' ? 'metric' : 'us') }
  })
}

let fontBytes: Uint8Array | undefined
// Roboto Flex as shipped with the app (the WOFF file of @fontsource/roboto-flex), embedded in the PDF.
type Fontkit = Parameters<PDFDocument['registerFontkit']>[0]
let fontkitLoad: Promise<Fontkit> | undefined
/** The font layout library, loaded with the first PDF rather than at server start (about 23 MB once loaded). */
export function loadFontkit(): Promise<Fontkit> {
  return (fontkitLoad ??= import('@pdf-lib/fontkit').then(m => m.default as Fontkit))
}

export function robotoFlex(): Uint8Array {
  if (!fontBytes) {
    const require = createRequire(import.meta.url)
    fontBytes = readFileSync(require.resolve('@fontsource/roboto-flex/files/roboto-flex-latin-400-normal.woff'))
  }
  return fontBytes
}

function fitText(text: string, font: PDFFont, size: number, width: number): string {
  if (font.widthOfTextAtSize(text, size) <= width) return text
  let t = text
  while (t.length > 1 && font.widthOfTextAtSize(`${t}…`, size) > width) t = t.slice(0, -1)
  return `${t}…`
}

// A sheet of labels: QR symbol (vector modules), the code in large type, the asset kind and its identity.
// The asset kinds are in the language of the person who printed the sheet (English when they chose none).
export async function buildLabelPdf(items: LabelItem[], layout: LabelSelection['layout'], paper: LabelSelection['paper'],
  progress: (done: number) => Promise<void> = async () => {}, language?: string | null): Promise<Uint8Array> {
  const t = mailWords(language)
  // (pdf-lib, about 15 MB once loaded, comes with the first PDF rather than at server start)
  const { PDFDocument: Pdf, rgb } = await import('pdf-lib')
  const doc = await Pdf.create()
  doc.registerFontkit(await loadFontkit())
  doc.setTitle('Bayward label sheet')
  doc.setCreator('Bayward')
  const font = await doc.embedFont(robotoFlex(), { subset: true })
  const grid = labelGrid(items.length, layout, paper)
  const pages = Array.from({ length: grid.pages }, () => doc.addPage([grid.paper.width, grid.paper.height]))
  for (const [i, item] of items.entries()) {
    const slot = grid.slots[i]!
    const page = pages[slot.page]!
    const pad = Math.min(slot.height * 0.08, 8)
    page.drawRectangle({ x: slot.x, y: slot.y, width: slot.width, height: slot.height, borderColor: rgb(0.8, 0.82, 0.86), borderWidth: 0.5 })
    const qrSide = slot.height - 2 * pad
    const qr = qrMatrix(tagUrlFor(item.code))
    const quiet = 2
    const cell = qrSide / (qr.size + 2 * quiet)
    const qx = slot.x + pad
    const qy = slot.y + pad
    for (let y = 0; y < qr.size; y++) {
      for (let x = 0; x < qr.size; x++) {
        if (qr.dark(x, y)) page.drawRectangle({ x: qx + (x + quiet) * cell, y: qy + qrSide - (y + quiet + 1) * cell, width: cell + 0.02, height: cell + 0.02, color: rgb(0, 0, 0) })
      }
    }
    const textX = qx + qrSide + pad
    const textWidth = slot.x + slot.width - pad - textX
    const codeSize = Math.min(slot.height * 0.26, textWidth / 4.2)
    const small = Math.max(5.5, codeSize * 0.42)
    page.drawText(fitText(item.code, font, codeSize, textWidth), { x: textX, y: slot.y + slot.height - pad - codeSize, size: codeSize, font })
    page.drawText(fitText(t(`asset_kind.${item.kind}`).toUpperCase(), font, small, textWidth), { x: textX, y: slot.y + slot.height - pad - codeSize - small * 1.5, size: small, font, color: rgb(0.35, 0.2, 0.5) })
    page.drawText(fitText(item.identity, font, small, textWidth), { x: textX, y: slot.y + pad + small * 0.3, size: small, font, color: rgb(0.2, 0.2, 0.25) })
    if (i % 10 === 9) await progress(i + 1)
  }
  await progress(items.length)
  return doc.save()
}

export interface LabelSheetInput { items: LabelItem[], layout: LabelSelection['layout'], paper: LabelSelection['paper'], language?: string | null }

// The label-sheet job: the PDF goes to the storage layer (jobs:<id>) and the tags count as printed.
export const labelSheetJob = defineJob('labels', async ({ items, layout, paper, language }: LabelSheetInput, run) => {
  const pdf = await buildLabelPdf(items, layout, paper, run.progress, language)
  await saveJobFile(run.jobId, pdf)
  await useDb().update(tables.tags).set({ printedAt: new Date() }).where(inArray(tables.tags.code, items.map(i => i.code)))
  return { labels: items.length, bytes: pdf.byteLength }
})
