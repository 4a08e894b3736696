import type { PDFDocument, PDFFont, PDFName, PDFOperator, PDFPage } from 'pdf-lib'
import { pageHeaderText, pageNumberText, type AuditPackStamp, type PackWords } from '#shared/utils/audit-pack'
import { loadFontkit, robotoFlex } from '../labels'
import type { PackColumn } from './sections'

// pdf-lib (about 15 MB once loaded) comes with the first pack rather than at server start: AuditPdf.create loads it.
type PdfLib = typeof import('pdf-lib')
let loaded: PdfLib | undefined
const pdfLib = (): PdfLib => {
  if (!loaded) throw new Error('pdf-lib is used before AuditPdf.create loaded it')
  return loaded
}

// The audit pack's PDF, written a row at a time: US Letter landscape, the stamp (site, range, made when and
// by whom) at the top of every page and its number at the foot, tables whose cells wrap to a few lines.
// A record replaced by a correction is struck through; its correction follows it.

const PAGE = { width: 792, height: 612 }
const MARGIN = 36
const BODY_TOP = PAGE.height - MARGIN - 22
const BODY_BOTTOM = MARGIN + 20
const SIZE = 7.5
const LINE = SIZE * 1.3
const MAX_LINES = 6
type Color = [number, number, number]
const INK: Color = [0.1, 0.12, 0.16]
const MUTED: Color = [0.38, 0.4, 0.45]
const RULE: Color = [0.82, 0.84, 0.88]

export class AuditPdf {
  private page!: PDFPage
  private fontKey!: PDFName
  private y = 0
  private columns: PackColumn[] = []
  private widths: number[] = []
  private tableTitle = ''

  private constructor(private readonly doc: PDFDocument, private readonly font: PDFFont, private readonly stamp: AuditPackStamp, private readonly t: PackWords) {}

  /** `t` writes the pack's own words in the language of the person who asked for it. */
  static async create(stamp: AuditPackStamp, t: PackWords): Promise<AuditPdf> {
    loaded ??= await import('pdf-lib')
    const doc = await pdfLib().PDFDocument.create()
    doc.registerFontkit(await loadFontkit())
    doc.setTitle(t('audit_pack.pdf.doc_title', { site: stamp.siteName, from: stamp.from, to: stamp.to }))
    doc.setCreator('Bayward')
    const font = await doc.embedFont(robotoFlex(), { subset: true })
    // Encoding a text lays it out with fontkit (about a quarter of a millisecond a cell); a pack repeats most
    // of its cells (areas, items, people, results), so each distinct text is encoded once. The first encoding
    // has already marked its glyphs for the subset, so reusing it changes nothing in the file.
    const encode = font.encodeText.bind(font)
    const encoded = new Map<string, ReturnType<PDFFont['encodeText']>>()
    font.encodeText = (text: string) => {
      let e = encoded.get(text)
      if (!e) encoded.set(text, e = encode(text))
      return e
    }
    const pdf = new AuditPdf(doc, font, stamp, t)
    pdf.newPage()
    return pdf
  }

  get pageCount() {
    return this.doc.getPageCount()
  }

  private newPage() {
    this.page = this.doc.addPage([PAGE.width, PAGE.height])
    this.fontKey = this.page.node.newFontDictionary(this.font.name, this.font.ref)
    this.y = BODY_TOP
  }

  private room(height: number) {
    if (this.y - height < BODY_BOTTOM) {
      this.newPage()
      if (this.columns.length) this.headerRow(true)
    }
  }

  // Widths from each character's advance, kept once per character: the font's own measure lays the text out
  // with fontkit on every call, which for thousands of cells costs seconds. Kerning is left out, so 2 % spare.
  private readonly advance = new Map<string, number>()
  private measure(t: string, size: number): number {
    let width = 0
    for (const ch of t) {
      let w = this.advance.get(ch)
      if (w === undefined) {
        w = this.font.widthOfTextAtSize(ch, 1000) / 1000
        this.advance.set(ch, w)
      }
      width += w
    }
    return width * size * 1.02
  }

  private text(t: string, x: number, size: number, color = INK) {
    this.page.drawText(t, { x, y: this.y - size, size, font: this.font, color: pdfLib().rgb(...color) })
  }

  /** Words wrapped to `width` at `size`, at most `max` lines (the last cut with an ellipsis). */
  wrap(t: string, width: number, size = SIZE, max = MAX_LINES): string[] {
    const clean = printable(t)
    if (!clean.includes('\n') && this.measure(clean, size) <= width) return [clean]
    const lines: string[] = []
    for (const paragraph of clean.split('\n')) {
      let line = ''
      for (const word of paragraph.split(/\s+/).filter(Boolean)) {
        const next = line ? `${line} ${word}` : word
        if (this.measure(next, size) <= width) line = next
        else {
          if (line) lines.push(line)
          line = this.fit(word, width, size)
        }
      }
      lines.push(line)
    }
    if (lines.length > max) lines.splice(max - 1, lines.length, this.fit(`${lines[max - 1]} …`, width, size))
    return lines
  }

  private fit(t: string, width: number, size: number): string {
    if (this.measure(t, size) <= width) return t
    let s = t
    while (s.length > 1 && this.measure(`${s}…`, size) > width) s = s.slice(0, -1)
    return `${s}…`
  }

  heading(title: string) {
    this.columns = []
    this.room(60)
    this.y -= 8
    this.text(title, MARGIN, 14)
    this.y -= 20
  }

  paragraph(t: string) {
    const lines = this.wrap(t, PAGE.width - 2 * MARGIN, 8.5, 20)
    for (const line of lines) {
      this.room(12)
      this.text(line, MARGIN, 8.5, MUTED)
      this.y -= 11
    }
    this.y -= 3
  }

  table(title: string, columns: PackColumn[]) {
    this.columns = []
    this.room(48)
    this.y -= 4
    this.text(title, MARGIN, 10)
    this.y -= 15
    const total = columns.reduce((s, c) => s + c.width, 0)
    this.widths = columns.map(c => (c.width / total) * (PAGE.width - 2 * MARGIN))
    this.columns = columns
    this.tableTitle = title
    this.headerRow(false)
  }

  private headerRow(continued: boolean) {
    if (continued) {
      this.text(this.t('audit_pack.pdf.continued', { title: this.tableTitle }), MARGIN, 8, MUTED)
      this.y -= 12
    }
    this.cells(this.columns.map(c => c.label), { color: MUTED, rule: true })
  }

  row(values: string[], struck = false) {
    this.cells(values, { color: struck ? MUTED : INK, struck })
  }

  // A row as one text object and a few strokes, written as raw operators: drawing each cell through
  // drawText costs nine operators and a graphics state apiece, which over a year of records is most of the time.
  private cells(values: string[], o: { color: Color, struck?: boolean, rule?: boolean }) {
    const { beginText, endText, lineTo, moveTo, popGraphicsState, pushGraphicsState, setFillingRgbColor, setFontAndSize, setLineWidth, setStrokingRgbColor, setTextMatrix, showText, stroke } = pdfLib()
    const pad = 3
    const wrapped = values.map((v, i) => this.wrap(v, this.widths[i]! - 2 * pad))
    const height = Math.max(...wrapped.map(l => l.length)) * LINE + 3
    this.room(height)
    const text: PDFOperator[] = [pushGraphicsState(), setFillingRgbColor(...o.color), beginText(), setFontAndSize(this.fontKey, SIZE)]
    const strokes: PDFOperator[] = [setStrokingRgbColor(...o.color), setLineWidth(0.5)]
    let x = MARGIN
    for (const [i, lines] of wrapped.entries()) {
      lines.forEach((line, n) => {
        if (!line) return
        const y = this.y - 2 - n * LINE - SIZE
        text.push(setTextMatrix(1, 0, 0, 1, x + pad, y), showText(this.font.encodeText(line)))
        if (o.struck && i < wrapped.length - 1) {
          const w = this.measure(line, SIZE) / 1.02
          strokes.push(moveTo(x + pad, y + SIZE * 0.32), lineTo(x + pad + w, y + SIZE * 0.32), stroke())
        }
      })
      x += this.widths[i]!
    }
    this.y -= height
    text.push(endText())
    if (!o.struck) strokes.length = 0
    strokes.push(setStrokingRgbColor(...(o.rule ? MUTED : RULE)), setLineWidth(o.rule ? 0.8 : 0.3), moveTo(MARGIN, this.y), lineTo(PAGE.width - MARGIN, this.y), stroke())
    this.page.pushOperators(...text, ...strokes, popGraphicsState())
  }

  /** A line after a table (its totals, or that it is empty). */
  after(t: string) {
    this.columns = []
    this.room(16)
    this.y -= 4
    this.text(t, MARGIN, 8, MUTED)
    this.y -= 14
  }

  /** The stamp on every page and "Page n of N" at each foot, then the bytes. */
  async save(): Promise<Uint8Array> {
    const pages = this.doc.getPages()
    const header = this.fit(pageHeaderText(this.stamp, this.t), PAGE.width - 2 * MARGIN, 9)
    pages.forEach((page, i) => {
      page.drawText(header, { x: MARGIN, y: PAGE.height - MARGIN - 9, size: 9, font: this.font, color: pdfLib().rgb(...INK) })
      page.drawLine({ start: { x: MARGIN, y: PAGE.height - MARGIN - 14 }, end: { x: PAGE.width - MARGIN, y: PAGE.height - MARGIN - 14 }, thickness: 0.6, color: pdfLib().rgb(...MUTED) })
      const footer = pageNumberText(i + 1, pages.length, this.t)
      page.drawText(footer, { x: PAGE.width - MARGIN - this.font.widthOfTextAtSize(footer, 8), y: MARGIN, size: 8, font: this.font, color: pdfLib().rgb(...MUTED) })
      page.drawText(this.t('audit_pack.pdf.footer'), { x: MARGIN, y: MARGIN, size: 8, font: this.font, color: pdfLib().rgb(...MUTED) })
    })
    return this.doc.save()
  }
}

// Tabs and control characters would print as boxes; the shipped font covers Latin text.
function printable(t: string): string {
  return String(t ?? '').replace(/\r\n?/g, '\n').replace(/[\t\v\f]/g, ' ').split('').filter(ch => ch === '\n' || (ch >= ' ' && ch !== '\u007F')).join('')
}
