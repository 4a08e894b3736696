import { sql } from 'drizzle-orm'
import type { DueSubjectKind, ScheduleDefinition } from '../../../shared/utils/due-schedules'
import { scheduleRuleKey } from '../../../shared/utils/due-schedules'
import type { ObligationRecord } from '../../../shared/utils/due-rules'
import { batteryObligations, batteryStatusFrom, type BatteryStatusRow } from '../../../shared/utils/derived-battery'
import {
  areaObligations, chargerObligations, cylinderObligations, followUpObligations, logObligations, operatorObligations,
  siteObligations, truckObligations, truckStatusFrom, type TruckStatusRow,
} from '../../../shared/utils/derived-subjects'
import { requalificationYearsFromSettings } from '../../../shared/utils/fuel-policy'
import { idIn, type SqlRunner } from './effective'
import { loadBatteryFactsFor } from './facts-battery'
import { loadAreaFactsFor, loadChargerFactsFor, loadCylinderFactsFor, loadTruckFactsFor } from './facts-assets'
import { loadCompletionFacts, loadFollowUpFactsFor, loadLogFactsFor, loadOperatorFactsFor, loadSiteFacts } from './facts-people'
import { loadSiteContext, type SiteContext } from './site-context'
import { writeReadModels, type ReadModelDb, type WriteScope } from './write'

// The rule module's server half: load the facts of the subjects a write touched (effective records
// only), compute their read models with the pure rules in shared/utils, and write them — in the caller's
// transaction. The write path, `npm run rebuild-state` and the tests all come through here.

/** Something whose read models a write changes. */
export interface SubjectRef {
  kind: DueSubjectKind
  id: string
}

export interface ComputedReadModels {
  obligations: ObligationRecord[]
  batteryStatus: BatteryStatusRow[]
  truckStatus: TruckStatusRow[]
}

const SUBJECT_TABLES: Partial<Record<DueSubjectKind, string>> = {
  battery: 'batteries', truck: 'trucks', charger: 'chargers', cylinder: 'lp_cylinders', area: 'areas', log: 'area_logs', follow_up: 'follow_ups',
}
const LOCK_ORDER: DueSubjectKind[] = ['truck', 'battery', 'charger', 'cylinder', 'area', 'log', 'follow_up']

const hasCustom = (ctx: SiteContext, kind: DueSubjectKind, rule?: ScheduleDefinition['rule']) =>
  ctx.schedules.some(s => s.kind === 'custom' && s.active && s.subjectKind === kind && (!rule || s.rule === rule))

/** The earliest moment a lead-added charges schedule counts battery charges from (when it was added). */
function customChargesSince(ctx: SiteContext): Date | null {
  const added = ctx.schedules.filter(s => s.kind === 'custom' && s.active && s.subjectKind === 'battery' && s.rule === 'charges')
    .map(s => (s.createdAt ? new Date(s.createdAt).getTime() : 0))
  return added.length ? new Date(Math.min(...added)) : null
}

/** `ids` per subject kind; undefined for "every subject of that kind at the site". */
export type SubjectSelection = Partial<Record<DueSubjectKind, readonly string[] | undefined>>

// Facts → read models for the selected subjects of one site.
export async function computeReadModels(db: SqlRunner, ctx: SiteContext, pick: SubjectSelection): Promise<ComputedReadModels> {
  const out: ComputedReadModels = { obligations: [], batteryStatus: [], truckStatus: [] }
  const tz = ctx.timeZone
  const sch = ctx.schedules
  const wanted = (k: DueSubjectKind) => k in pick
  const anyCustom = sch.some(s => s.kind === 'custom' && s.active)
  const subjectIds = Object.values(pick).every(v => v !== undefined) ? Object.values(pick).flat() as string[] : undefined
  // A write's recompute reads a few subjects by id with the same long statements every time: planning them
  // anew for each write cost more than running them, so they keep one generic plan for the rest of the
  // write's transaction (a no-op outside one). Whole-site reads (the rebuild) are planned for their data.
  // Sent without waiting for its answer: the look-ups below go after it on the same connection.
  const generic = subjectIds ? Promise.resolve(db.execute(sql`SET LOCAL plan_cache_mode = force_generic_plan`).then(() => undefined)) : undefined
  generic?.catch(() => undefined) // (its failure is answered below, not reported as unhandled while the completions load)
  const completions = anyCustom ? await loadCompletionFacts(db, ctx.id, subjectIds) : []
  const [batteries, trucks, chargers, areas, cylinders, people, logs, followUps, sites] = await Promise.all([
    wanted('battery') ? loadBatteryFactsFor(db, { siteId: ctx.id, batteryIds: pick.battery, chargesSince: customChargesSince(ctx) }, completions) : [],
    wanted('truck') ? loadTruckFactsFor(db, { siteId: ctx.id, truckIds: pick.truck, allReadings: hasCustom(ctx, 'truck', 'hours') }, completions) : [],
    wanted('charger') ? loadChargerFactsFor(db, ctx.id, pick.charger, completions) : [],
    wanted('area') ? loadAreaFactsFor(db, ctx.id, pick.area, completions) : [],
    wanted('cylinder') ? loadCylinderFactsFor(db, ctx.id, pick.cylinder, completions) : [],
    wanted('person') ? loadOperatorFactsFor(db, ctx.id, pick.person) : [],
    wanted('log') ? loadLogFactsFor(db, ctx.id, pick.log) : [],
    wanted('follow_up') ? loadFollowUpFactsFor(db, ctx.id, pick.follow_up) : [],
    wanted('site') ? loadSiteFacts(db, ctx.id, completions) : [],
    generic,
  ])
  const policy = { coolDownMinutes: ctx.settings.coolDownMinutes, cellSpreadThreshold: ctx.settings.cellSpreadThreshold, maxChargeTempF: ctx.settings.maxChargeTempF }
  for (const f of batteries) {
    out.batteryStatus.push(batteryStatusFrom(f, policy))
    out.obligations.push(...batteryObligations(f, sch, tz))
  }
  for (const f of trucks) {
    out.truckStatus.push(truckStatusFrom(f))
    out.obligations.push(...truckObligations(f, sch, tz))
  }
  const years = requalificationYearsFromSettings(ctx.settings)
  for (const f of chargers) out.obligations.push(...chargerObligations(f, sch, tz))
  for (const f of areas) out.obligations.push(...areaObligations(f, sch, tz))
  for (const f of cylinders) out.obligations.push(...cylinderObligations(f, sch, years, tz))
  for (const f of people) out.obligations.push(...operatorObligations(f, sch, tz))
  for (const f of logs) out.obligations.push(...logObligations(f, sch))
  for (const f of followUps) out.obligations.push(...followUpObligations(f, sch))
  if (pick.site === undefined || pick.site.includes(ctx.id)) for (const f of sites) out.obligations.push(...siteObligations(f, sch, tz))
  return out
}

function selectionOf(subjects: readonly SubjectRef[]): SubjectSelection {
  const pick: Record<string, string[]> = {}
  for (const s of subjects) {
    const ids = (pick[s.kind] ??= [])
    if (!ids.includes(s.id)) ids.push(s.id)
  }
  return pick as SubjectSelection
}

// Locks the subjects' rows (in one order for every caller) so two writes about one subject recompute
// one after the other, each seeing the other's record.
async function lockSubjects(db: SqlRunner, pick: SubjectSelection) {
  for (const kind of LOCK_ORDER) {
    const ids = pick[kind]
    const table = SUBJECT_TABLES[kind]
    if (!ids?.length || !table) continue
    await db.execute(sql`SELECT 1 FROM ${sql.raw(table)} WHERE ${idIn('id', [...ids].sort())} ORDER BY id FOR NO KEY UPDATE`)
  }
}

export interface RecomputeOptions {
  /** false when the caller already holds the subjects' row locks (the swap does) */
  lock?: boolean
  /** the site's context when the caller has it already */
  ctx?: SiteContext
}

/**
 * Recomputes the read models of the subjects one write touched, in the caller's transaction: every
 * record write calls this with what it changed (a swap: both batteries and the truck; a log entry: the
 * area, its chargers, the log and any follow-up it opened).
 */
export async function recomputeSubjects(db: ReadModelDb, siteId: string, subjects: readonly SubjectRef[], opts: RecomputeOptions = {}): Promise<ComputedReadModels> {
  const empty = { obligations: [], batteryStatus: [], truckStatus: [] }
  if (subjects.length === 0) return empty
  const pick = selectionOf(subjects)
  if (opts.lock !== false) await lockSubjects(db, pick)
  const ctx = opts.ctx ?? await loadSiteContext(db, siteId)
  const computed = await computeReadModels(db, ctx, pick)
  const scope: WriteScope = { siteId, subjectIds: subjects.map(s => s.id) }
  await writeReadModels(db, scope, computed)
  return computed
}

/** A schedule was added or changed: its obligations at the site, for every subject of its kind. */
export async function recomputeSchedule(db: ReadModelDb, siteId: string, schedule: Pick<ScheduleDefinition, 'kind' | 'id' | 'subjectKind'>): Promise<void> {
  const ctx = await loadSiteContext(db, siteId)
  const key = scheduleRuleKey(schedule)
  const computed = await computeReadModels(db, ctx, { [schedule.subjectKind]: undefined })
  await writeReadModels(db, { siteId, ruleKeys: [key] }, { obligations: computed.obligations.filter(o => o.ruleKey === key), batteryStatus: [], truckStatus: [] })
}

/** Every read model of one site, from scratch (the recovery path, and after a site-wide policy change). */
export async function rebuildSiteReadModels(db: ReadModelDb, siteId: string): Promise<ComputedReadModels> {
  const ctx = await loadSiteContext(db, siteId)
  const all: SubjectSelection = { battery: undefined, truck: undefined, charger: undefined, area: undefined, cylinder: undefined, person: undefined, log: undefined, follow_up: undefined, site: undefined }
  const computed = await computeReadModels(db, ctx, all)
  await writeReadModels(db, { siteId, wholeSite: true }, computed)
  return computed
}
