import { localDate } from './due-dates'
import type { ScheduleDefinition } from './due-schedules'
import { dayBefore, hoursAsOf, plusInterval, scheduleObligation, type HourReading, type ObligationRecord, type ObligationSubject } from './due-rules'
import { customObligations, type CompletionFact } from './derived-custom'
import { cylinderRequalificationDue } from './fuel-policy'
import type { RequalificationMethod } from './requalification'
import { inspectionHold, type InspectionFact } from './truck-inspection'

// Obligations of every subject but batteries, and the truck status row, from effective records.

const scheduleOf = (schedules: readonly ScheduleDefinition[], kind: ScheduleDefinition['kind']) =>
  schedules.find(s => s.kind === kind && s.active && (s.every !== null || s.rule === 'date_rule'))

export interface TruckFacts {
  id: string
  siteId: string
  fleetNumber: string
  tagCode: string | null
  homeAreaId: string | null
  power: 'electric' | 'lp_gas' | 'gasoline' | 'diesel'
  outOfService: boolean
  createdAt: Date
  /** the hour meter as registered (the registry field) */
  registeredHours: number
  /** effective hour-meter readings (swaps, cylinder changes, completions), oldest first */
  readings: HourReading[]
  /** the latest effective emissions test */
  lastEmissions: { testedOn: string, passed: boolean } | null
  completions: CompletionFact[]
  /** pre-shift inspections with a failed critical item since the last return to service */
  failedInspections?: InspectionFact[]
  lastReturnAt?: Date | null
  lastInspectionAt?: Date | null
}

export interface TruckStatusRow {
  truckId: string
  siteId: string
  hourMeter: number
  hourMeterAt: Date | null
  lastInspectionAt: Date | null
  holdInspectionId: string | null
  holdSince: Date | null
  holdBy: string | null
  holdReason: string | null
}

export function truckStatusFrom(f: TruckFacts): TruckStatusRow {
  const last = f.readings.at(-1) ?? null
  const hold = inspectionHold(f.failedInspections ?? [], f.lastReturnAt ?? null)
  return {
    truckId: f.id, siteId: f.siteId, hourMeter: last ? last.hours : f.registeredHours, hourMeterAt: last?.at ?? null,
    lastInspectionAt: f.lastInspectionAt ?? null,
    holdInspectionId: hold?.inspectionId ?? null, holdSince: hold?.since ?? null, holdBy: hold?.byUserId ?? null, holdReason: hold?.reason ?? null,
  }
}

/** When the next emissions test is due after one on `testedOn`: the schedule's interval, or its retest window after a fail. */
export function emissionsNextDue(testedOn: string, passed: boolean, schedule: Pick<ScheduleDefinition, 'every' | 'everyUnit' | 'afterFailDays'>): string {
  return passed ? plusInterval(testedOn, schedule.every ?? 1, schedule.everyUnit ?? 'year') : plusInterval(testedOn, schedule.afterFailDays ?? 30, 'day')
}

export function truckObligations(f: TruckFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  if (f.outOfService) return []
  const subject: ObligationSubject = { kind: 'truck', id: f.id, label: f.fleetNumber, tagCode: f.tagCode, areaId: f.homeAreaId }
  const out: ObligationRecord[] = []
  const emissions = scheduleOf(schedules, 'emissions_test')
  if (emissions && f.power !== 'electric') {
    const last = f.lastEmissions
    out.push(scheduleObligation(emissions, subject, {
      lastDoneOn: last?.testedOn ?? null,
      startOn: localDate(f.createdAt, timeZone),
      dueOnOverride: last ? emissionsNextDue(last.testedOn, last.passed, emissions) : dayBefore(localDate(f.createdAt, timeZone)),
      detail: !last ? 'No test on record' : last.passed ? null : 'Retest after a failed test',
      detailWords: !last ? { code: 'no_test' } : last.passed ? null : { code: 'retest' },
    }))
  }
  out.push(...customObligations(schedules, subject, f.createdAt, f.completions, { readings: f.readings, registeredHours: f.registeredHours }, timeZone))
  return out
}

/** The hour meter of a truck as of now: its latest effective reading, or the registered value. */
export const truckHours = (f: Pick<TruckFacts, 'readings' | 'registeredHours'>) => hoursAsOf(f.readings, null, f.registeredHours)

export interface ChargerFacts {
  id: string
  siteId: string
  name: string
  tagCode: string | null
  areaId: string
  outOfService: boolean
  createdAt: Date
  /** the latest effective pass of the charger item in its area's logs */
  lastInspectedAt: Date | null
  completions: CompletionFact[]
}

export function chargerObligations(f: ChargerFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  if (f.outOfService) return []
  const subject: ObligationSubject = { kind: 'charger', id: f.id, label: f.name, tagCode: f.tagCode, areaId: f.areaId }
  const out: ObligationRecord[] = []
  const s = scheduleOf(schedules, 'charger_inspection')
  if (s) out.push(scheduleObligation(s, subject, { lastDoneOn: f.lastInspectedAt ? localDate(f.lastInspectedAt, timeZone) : null, startOn: localDate(f.createdAt, timeZone) }))
  out.push(...customObligations(schedules, subject, f.createdAt, f.completions, {}, timeZone))
  return out
}

export interface AreaFacts {
  id: string
  siteId: string
  name: string
  tagCode: string | null
  kind: 'charging_area' | 'fuel_station'
  archived: boolean
  createdAt: Date
  /** the latest daily log with every item of its checklist recorded */
  lastCompleteDailyLogOn: string | null
  lastEyewashPassAt: Date | null
  lastExtinguisherPassAt: Date | null
  lastCoReadingOn: string | null
  /** whether the site runs a combustion truck in service (indoor CO monitoring applies) */
  siteRunsCombustion: boolean
  completions: CompletionFact[]
}

export function areaObligations(f: AreaFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  if (f.archived) return []
  const subject: ObligationSubject = { kind: 'area', id: f.id, label: f.name, tagCode: f.tagCode, areaId: f.id }
  const created = localDate(f.createdAt, timeZone)
  const on = (d: Date | null) => (d ? localDate(d, timeZone) : null)
  const out: ObligationRecord[] = []
  const add = (kind: ScheduleDefinition['kind'], lastDoneOn: string | null, startOn = created) => {
    const s = scheduleOf(schedules, kind)
    if (s) out.push(scheduleObligation(s, subject, { lastDoneOn, startOn }))
  }
  add('area_checklist', f.lastCompleteDailyLogOn, dayBefore(created))
  if (f.kind === 'charging_area') add('eyewash_activation', on(f.lastEyewashPassAt))
  add('extinguisher_visual', on(f.lastExtinguisherPassAt))
  if (f.siteRunsCombustion) add('co_monitoring', f.lastCoReadingOn)
  out.push(...customObligations(schedules, subject, f.createdAt, f.completions, {}, timeZone))
  return out
}

export interface CylinderFacts {
  id: string
  siteId: string
  serial: string
  tagCode: string | null
  areaId: string | null
  condemned: boolean
  createdAt: Date
  manufactureYear: number
  manufactureMonth: number
  /** the newest requalification: the registry's, or the latest effective passed record's */
  lastRequalifiedOn: string | null
  lastRequalificationMethod: RequalificationMethod | null
  completions: CompletionFact[]
}

export function cylinderObligations(f: CylinderFacts, schedules: readonly ScheduleDefinition[], years: Readonly<Record<RequalificationMethod, number>>, timeZone: string): ObligationRecord[] {
  if (f.condemned) return []
  const subject: ObligationSubject = { kind: 'cylinder', id: f.id, label: f.serial, tagCode: f.tagCode, areaId: f.areaId }
  const out: ObligationRecord[] = []
  const s = scheduleOf(schedules, 'cylinder_requalification')
  if (s) {
    out.push(scheduleObligation(s, subject, {
      lastDoneOn: f.lastRequalifiedOn, startOn: localDate(f.createdAt, timeZone), ruleDueOn: cylinderRequalificationDue(f, years),
      detail: `Stamped ${String(f.manufactureMonth).padStart(2, '0')}-${f.manufactureYear}`,
      detailWords: { code: 'stamped', params: { stamp: `${String(f.manufactureMonth).padStart(2, '0')}-${f.manufactureYear}` } },
    }))
  }
  out.push(...customObligations(schedules, subject, f.createdAt, f.completions, {}, timeZone))
  return out
}

export interface OperatorFacts {
  userId: string
  siteId: string
  name: string
  /** when the operator role was given at the site */
  memberSince: Date
  /** per truck class, the latest qualification record */
  truckQualifications: { expiresOn: string, evaluatedOn: string | null }[]
  /** the latest event calling for retraining (1910.178(l)(4)(ii)), if any */
  retraining?: { happenedOn: string, reason: string } | null
}

// 29 CFR 1910.178(l)(4)(iii): due at the earliest of each class's expiry and its evaluation plus the interval.
export function operatorObligations(f: OperatorFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  const s = scheduleOf(schedules, 'operator_evaluation')
  if (!s) return []
  const subject: ObligationSubject = { kind: 'person', id: f.userId, label: f.name, tagCode: null, areaId: null, personId: f.userId }
  const dues = f.truckQualifications.map(q => (q.evaluatedOn ? [q.expiresOn, plusInterval(q.evaluatedOn, s.every ?? 3, s.everyUnit)].sort()[0]! : q.expiresOn))
  const evaluated = f.truckQualifications.map(q => q.evaluatedOn).filter((d): d is string => !!d).sort().at(-1) ?? null
  const none = dues.length === 0
  // an incident, a near miss or a new truck type after the latest evaluation makes one due from that day
  const called = f.retraining && (!evaluated || f.retraining.happenedOn >= evaluated) ? f.retraining : null
  const dueOn = none ? localDate(f.memberSince, timeZone) : dues.sort()[0]!
  return [scheduleObligation(s, subject, {
    lastDoneOn: evaluated, startOn: localDate(f.memberSince, timeZone),
    dueOnOverride: called && called.happenedOn < dueOn ? called.happenedOn : dueOn,
    detail: called ? `Retraining called for on ${called.happenedOn}` : none ? 'No truck evaluation on record' : null,
    detailWords: called ? { code: 'retraining_called', params: { on: called.happenedOn } } : none ? { code: 'no_evaluation' } : null,
  })]
}

export interface LogFacts {
  id: string
  siteId: string
  areaId: string
  areaName: string
  periodStart: string
  cadence: 'daily' | 'weekly'
  signed: boolean
  entryCount: number
  failedCount: number
}

export function logObligations(f: LogFacts, schedules: readonly ScheduleDefinition[]): ObligationRecord[] {
  const s = scheduleOf(schedules, 'log_review')
  if (!s || f.signed || f.entryCount === 0) return []
  const subject: ObligationSubject = { kind: 'log', id: f.id, label: `${f.areaName} · ${f.periodStart}`, tagCode: null, areaId: f.areaId, periodStart: f.periodStart }
  const dueOn = f.cadence === 'weekly' ? plusInterval(f.periodStart, 7, 'day') : plusInterval(f.periodStart, s.every ?? 1, s.everyUnit)
  return [scheduleObligation(s, subject, {
    lastDoneOn: null, startOn: f.periodStart, dueOnOverride: dueOn, detail: f.failedCount > 0 ? `${f.failedCount} failed item(s)` : null,
    detailWords: f.failedCount > 0 ? { code: 'failed_items', params: { n: f.failedCount } } : null,
  })]
}

export interface FollowUpFacts {
  id: string
  siteId: string
  title: string
  ownerUserId: string | null
  ownerName: string | null
  /** a due date set on the follow-up itself, if any */
  dueOn: string | null
  /** the day the failure or incident happened */
  openedOn: string
  closed: boolean
}

/** A follow-up is due its schedule's interval after the failure or incident it follows. */
export function followUpObligations(f: FollowUpFacts, schedules: readonly ScheduleDefinition[]): ObligationRecord[] {
  const s = scheduleOf(schedules, 'follow_up')
  if (!s || f.closed) return []
  const subject: ObligationSubject = { kind: 'follow_up', id: f.id, label: f.title, tagCode: null, areaId: null, personId: f.ownerUserId }
  return [scheduleObligation(s, subject, {
    lastDoneOn: null, startOn: f.openedOn, dueOnOverride: f.dueOn ?? followUpDueOn(f.openedOn, s), detail: f.ownerName,
  })]
}

export function followUpDueOn(openedOn: string, schedule: Pick<ScheduleDefinition, 'every' | 'everyUnit'>): string {
  return plusInterval(openedOn, schedule.every ?? 3, schedule.everyUnit)
}

export interface SiteFacts {
  id: string
  siteId: string
  name: string
  createdAt: Date
  completions: CompletionFact[]
}

export function siteObligations(f: SiteFacts, schedules: readonly ScheduleDefinition[], timeZone: string): ObligationRecord[] {
  const subject: ObligationSubject = { kind: 'site', id: f.id, label: f.name, tagCode: null, areaId: null }
  return customObligations(schedules, subject, f.createdAt, f.completions, {}, timeZone)
}
