import type { PgColumn, PgTable } from 'drizzle-orm/pg-core'
import type { AssetKind } from '#shared/utils/asset-schemas'
import type { ReasonParams } from '#shared/utils/battery-fit'
import { CORRECTION_ABILITIES, type CorrectableKind } from '#shared/utils/correction-schemas'
import { parseSiteSettings } from '#shared/utils/site-settings'
import type { Actor } from './auth'
import { CORRECTABLE_KIND_TABLES, firstEnteredAt } from './due/effective'
import { mailCoded, mailWords } from './mail-words'

/** The event record behind a timeline row, for corrections: what it corrects, what corrects it, why. */
export interface HistoryRecord {
  kind: CorrectableKind
  id: string
  correctsId: string | null
  /** the row that stands in this one's place, when it was corrected */
  correctedById: string | null
  reason: string | null
  /** the record's correctable values, to fill in the "Correct this" form */
  values: Record<string, unknown>
  /** serial or fleet number of each asset id among the values (set by the history route) */
  labels?: Record<string, string>
}

/**
 * A timeline line as a code (`history.<code>` in every locale file) with its numbers and names, values with a
 * unit in the stored unit named by its suffix (`end_f`, `water_gal`), as refusals travel: the page says it in
 * the reader's language and the site's units. `title` and `detail` stay as the English words (CSV, fallback).
 */
export interface HistoryWords { code: string, params?: ReasonParams }

export interface HistoryEntry {
  /** unique within the timeline, e.g. 'audit-12' or 'swap-<uuid>' */
  id: string
  at: Date | string
  /** short title in words: "Put in truck MB-12", "Charged on C-3" */
  title: string
  who: string
  detail?: string | null
  titleWords?: HistoryWords
  /** the detail as coded parts, joined with " · " */
  detailWords?: HistoryWords[]
  tone?: 'neutral' | 'danger' | 'warning' | 'caution' | 'notice' | 'safe'
  changes?: { field: string, from: unknown, to: unknown }[]
  record?: HistoryRecord
  /** whether the person asking may correct it now (set by the history route) */
  mayCorrect?: boolean
}

const ENGLISH = mailWords('en')

/** A line from its coded words, with the English words (US units) as `title` and `detail` for the CSV and the fallback. */
export function historyLine(title: HistoryWords, detail: HistoryWords[] = []): Pick<HistoryEntry, 'title' | 'titleWords' | 'detail' | 'detailWords'> {
  const english = (w: HistoryWords) => mailCoded(ENGLISH, `history.${w.code}`, w.params, 'us')
  return { title: english(title), titleWords: title, detail: detail.length ? detail.map(english).join(' · ') : null, detailWords: detail }
}

type HistorySource = (assetId: string, limit: number) => Promise<HistoryEntry[]>

// Feature modules add their event records (swaps, charges, checks, refills, tests) to an asset's
// timeline here; the history route merges every source, newest first.
const sources: Partial<Record<AssetKind, HistorySource[]>> = {}

export function registerHistorySource(kind: AssetKind, source: HistorySource) {
  ;(sources[kind] ??= []).push(source)
}

export function historySourcesFor(kind: AssetKind): HistorySource[] {
  return sources[kind] ?? []
}

/** Which of `ids` another row of `table` corrects, and by which row. */
export async function correctedByOf(table: PgTable & { id: PgColumn, correctsId: PgColumn }, ids: string[]): Promise<Map<string, string>> {
  if (ids.length === 0) return new Map()
  const rows = await useDb().select({ id: table.id, correctsId: table.correctsId }).from(table).where(inArray(table.correctsId, ids)) as { id: string, correctsId: string }[]
  return new Map(rows.map(r => [r.correctsId, r.id]))
}

/** A timeline row for an event record: marked as a correction (with why) or as corrected. */
export function recordEntry(entry: HistoryEntry, kind: CorrectableKind, row: { id: string, correctsId: string | null, correctionReason: string | null }, correctedBy: Map<string, string>, values: Record<string, unknown>): HistoryEntry {
  const record: HistoryRecord = { kind, id: row.id, correctsId: row.correctsId, correctedById: correctedBy.get(row.id) ?? null, reason: row.correctionReason, values }
  return { ...entry, title: row.correctsId ? `Correction: ${entry.title}` : entry.title, record }
}

/** The timeline with `mayCorrect` on each record row the actor may correct now (standing, within the window or a lead). */
export async function correctableTimeline(actor: Actor, siteId: string, items: HistoryEntry[]): Promise<HistoryEntry[]> {
  const [site] = await useDb().select({ settings: tables.sites.settings }).from(tables.sites).where(eq(tables.sites.id, siteId))
  const windowDays = parseSiteSettings(site?.settings).correctionWindowDays
  const entered = await enteredAtOf(items)
  const names = await assetNames(items.flatMap(h => Object.entries(h.record?.values ?? {}).filter(([k, v]) => k.endsWith('Id') && typeof v === 'string').map(([, v]) => v as string)))
  return items.map((h) => {
    if (!h.record) return h
    const labels = Object.fromEntries(Object.entries(h.record.values).filter(([, v]) => typeof v === 'string' && names.has(v)).map(([k, v]) => [k, names.get(v as string)!]))
    const mayCorrect = !h.record.correctedById && correctionAllowed(actor, CORRECTION_ABILITIES[h.record.kind], siteId, entered.get(h.record.id) ?? new Date(h.at), windowDays) === 'yes'
    return { ...h, record: { ...h.record, labels }, mayCorrect }
  })
}

/** When each record row's chain of corrections was first entered, by record id (the window counts from it). */
async function enteredAtOf(items: HistoryEntry[]): Promise<Map<string, Date>> {
  const byKind = new Map<CorrectableKind, string[]>()
  for (const h of items) if (h.record && !h.record.correctedById) byKind.set(h.record.kind, [...(byKind.get(h.record.kind) ?? []), h.record.id])
  const maps = await Promise.all([...byKind].map(([kind, ids]) => firstEnteredAt(useDb(), CORRECTABLE_KIND_TABLES[kind], ids)))
  return new Map(maps.flatMap(m => [...m]))
}

/** Battery serials, truck fleet numbers and cylinder serials of the given ids. */
async function assetNames(ids: string[]): Promise<Map<string, string>> {
  const unique = [...new Set(ids)]
  if (unique.length === 0) return new Map()
  const db = useDb()
  const [b, t, c] = await Promise.all([
    db.select({ id: tables.batteries.id, name: tables.batteries.serial }).from(tables.batteries).where(inArray(tables.batteries.id, unique)),
    db.select({ id: tables.trucks.id, name: tables.trucks.fleetNumber }).from(tables.trucks).where(inArray(tables.trucks.id, unique)),
    db.select({ id: tables.lpCylinders.id, name: tables.lpCylinders.serial }).from(tables.lpCylinders).where(inArray(tables.lpCylinders.id, unique)),
  ])
  return new Map([...b, ...t, ...c].map(r => [r.id, r.name]))
}

export const HISTORY_CSV_COLUMNS = ['at', 'title', 'who', 'detail', 'recordKind', 'recordId', 'corrects', 'correctedBy', 'correctionReason'] as const

export function historyCsvRows(items: HistoryEntry[]): unknown[][] {
  return items.map(h => [
    new Date(h.at).toISOString(), h.title, h.who, h.detail ?? '', h.record?.kind ?? '', h.record?.id ?? '',
    h.record?.correctsId ?? '', h.record?.correctedById ?? '', h.record?.reason ?? '',
  ])
}
