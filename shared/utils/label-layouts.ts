// Label sheets: paper sizes and label layouts, in PostScript points (1 in = 72 pt, 1 mm = 72/25.4 pt).

export const POINTS_PER_INCH = 72
export const POINTS_PER_MM = 72 / 25.4

export type PaperSize = 'letter' | 'a4'
export type LabelLayoutKey = 'compact' | 'standard' | 'large'

/** ISO 216 A4 is 210 × 297 mm; US Letter is 8.5 × 11 in. */
export const PAPER_POINTS: Record<PaperSize, { width: number, height: number, label: string }> = {
  letter: { width: 8.5 * POINTS_PER_INCH, height: 11 * POINTS_PER_INCH, label: 'US Letter (8.5 × 11 in)' },
  a4: { width: 210 * POINTS_PER_MM, height: 297 * POINTS_PER_MM, label: 'A4 (210 × 297 mm)' },
}

interface LayoutSpec {
  label: string
  /** label size on each paper, points */
  size: Record<PaperSize, { width: number, height: number }>
  gap: number
  margin: number
}

export const LABEL_LAYOUTS: Record<LabelLayoutKey, LayoutSpec> = {
  compact: {
    label: 'Compact — 2 × 1 in / 50 × 25 mm (chargers, small items)',
    size: { letter: { width: 2 * POINTS_PER_INCH, height: 1 * POINTS_PER_INCH }, a4: { width: 50 * POINTS_PER_MM, height: 25 * POINTS_PER_MM } },
    gap: 0, margin: 36,
  },
  standard: {
    label: 'Standard — 3 × 1.5 in / 70 × 37 mm (batteries, cylinders)',
    size: { letter: { width: 3 * POINTS_PER_INCH, height: 1.5 * POINTS_PER_INCH }, a4: { width: 70 * POINTS_PER_MM, height: 37 * POINTS_PER_MM } },
    gap: 8, margin: 24,
  },
  large: {
    label: 'Large — 4 × 3 in / 105 × 74 mm (trucks, area doors)',
    size: { letter: { width: 4 * POINTS_PER_INCH, height: 3 * POINTS_PER_INCH }, a4: { width: 105 * POINTS_PER_MM, height: 74 * POINTS_PER_MM } },
    gap: 0, margin: 18,
  },
}

export interface LabelSlot {
  page: number
  /** bottom-left corner, points, PDF coordinates (origin bottom-left) */
  x: number
  y: number
  width: number
  height: number
}

// Places `count` labels row by row on as many pages as they need.
export function labelGrid(count: number, layout: LabelLayoutKey, paper: PaperSize) {
  const spec = LABEL_LAYOUTS[layout]
  const page = PAPER_POINTS[paper]
  const { width, height } = spec.size[paper]
  const columns = Math.max(1, Math.floor((page.width - 2 * spec.margin + spec.gap) / (width + spec.gap)))
  const rows = Math.max(1, Math.floor((page.height - 2 * spec.margin + spec.gap) / (height + spec.gap)))
  const perPage = columns * rows
  // centre the grid on the page
  const left = (page.width - (columns * width + (columns - 1) * spec.gap)) / 2
  const top = page.height - (page.height - (rows * height + (rows - 1) * spec.gap)) / 2
  const slots: LabelSlot[] = []
  for (let i = 0; i < count; i++) {
    const n = i % perPage
    const col = n % columns
    const row = Math.floor(n / columns)
    slots.push({
      page: Math.floor(i / perPage),
      x: left + col * (width + spec.gap),
      y: top - (row + 1) * height - row * spec.gap,
      width,
      height,
    })
  }
  return { columns, rows, perPage, pages: Math.ceil(count / perPage), slots, paper: page }
}
