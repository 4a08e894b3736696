import Papa from 'papaparse'
import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { AssetKind } from '#shared/utils/asset-schemas'
import { assetCreateSchemas, assetFieldSchemas } from '#shared/utils/asset-schemas'

type FieldType = 'number' | 'boolean' | 'array' | 'string'

// The base type of a zod field under its default/nullable/optional wrappers.
function baseType(schema: z.ZodType): FieldType {
  let def = (schema as unknown as { _zod: { def: { type: string, innerType?: z.ZodType } } })._zod.def
  while (def.innerType) def = (def.innerType as unknown as { _zod: { def: typeof def } })._zod.def
  return def.type === 'number' ? 'number' : def.type === 'boolean' ? 'boolean' : def.type === 'array' ? 'array' : 'string'
}

/** CSV columns of an asset kind: its tag code then every registry field; area references by area name. */
export function csvColumns(kind: AssetKind): string[] {
  return ['tagCode', ...Object.keys(assetFieldSchemas[kind].shape)]
}

const AREA_FIELDS = new Set(['homeAreaId', 'areaId'])

export async function areaNames(siteId: string) {
  const rows = await useDb().select({ id: tables.areas.id, name: tables.areas.name }).from(tables.areas).where(eq(tables.areas.siteId, siteId))
  return { byId: new Map(rows.map(r => [r.id, r.name])), byName: new Map(rows.map(r => [r.name.toLowerCase(), r.id])) }
}

// A cell a spreadsheet would run as a formula — text starting with =, +, -, @, a tab or a carriage return
// (OWASP "CSV injection") — gets a leading apostrophe, also when it spans several lines (papaparse's own
// pattern for `escapeFormulae: true` misses those); numbers stay numbers. Every CSV Bayward sends goes
// through here.
const FORMULA_START = /^[=+\-@\t\r]/
export function csvText(fields: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return Papa.unparse({ fields: [...fields], data: rows.map(r => [...r]) }, { escapeFormulae: FORMULA_START })
}

export function toCsv(kind: AssetKind, rows: Record<string, unknown>[], areas: Map<string, string>): string {
  const columns = csvColumns(kind)
  return csvText(columns, rows.map(r => columns.map((c) => {
    const v = r[c]
    if (AREA_FIELDS.has(c)) return v ? areas.get(String(v)) ?? '' : ''
    if (Array.isArray(v)) return v.join(';')
    return v ?? ''
  })))
}

export interface CsvRowError { line: number, field: string, message: string }

// Parses a CSV of one asset kind into validated rows; every bad row is reported with its line number
// (the header is line 1) and the field's message. Nothing is written here.
export function parseAssetCsv(kind: AssetKind, text: string, areas: Map<string, string>) {
  const shape = assetFieldSchemas[kind].shape as Record<string, z.ZodType>
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), { header: true, skipEmptyLines: 'greedy', transformHeader: h => h.trim() })
  const errors: CsvRowError[] = []
  const rows: Record<string, unknown>[] = []
  const unknown = (parsed.meta.fields ?? []).filter(f => f !== 'tagCode' && !Object.hasOwn(shape, f))
  if (unknown.length) errors.push({ line: 1, field: unknown.join(', '), message: `Unknown column${unknown.length > 1 ? 's' : ''}; expected ${csvColumns(kind).join(', ')}.` })
  for (const e of parsed.errors) errors.push({ line: (e.row ?? 0) + 2, field: '', message: e.message })
  parsed.data.forEach((raw, i) => {
    const line = i + 2
    const values: Record<string, unknown> = {}
    for (const [key, schema] of Object.entries(shape)) {
      // an apostrophe our export put before a formula-like cell comes off again
      const cell = raw[key]?.trim().replace(/^'(?=[=+\-@\t\r])/, '')
      if (cell === undefined || cell === '') continue
      if (AREA_FIELDS.has(key)) {
        const id = areas.get(cell.toLowerCase())
        if (!id) errors.push({ line, field: key, message: `No area named "${cell}" at this site.` })
        values[key] = id ?? null
        continue
      }
      const type = baseType(schema)
      values[key] = type === 'number'
        ? (Number.isFinite(Number(cell)) ? Number(cell) : cell)
        : type === 'boolean'
          ? ['true', 'yes', '1'].includes(cell.toLowerCase())
          : type === 'array'
            ? cell.split(/[;|]/).map(s => s.trim()).filter(Boolean)
            : cell
    }
    const result = assetCreateSchemas[kind].safeParse(values)
    if (!result.success) {
      for (const issue of result.error.issues) errors.push({ line, field: issue.path.join('.'), message: issue.message })
    }
    else rows.push({ ...(result.data as Record<string, unknown>), _line: line })
  })
  return { rows, errors, total: parsed.data.length }
}

export function sendCsv(event: H3Event, filename: string, csv: string) {
  setHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setHeader(event, 'content-disposition', `attachment; filename="${filename}"`)
  return `\uFEFF${csv}`
}
