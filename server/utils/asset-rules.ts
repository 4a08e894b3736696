import type { AssetKind } from '#shared/utils/asset-schemas'
import type { Actor } from './auth'

// Rules of the asset registry that its zod schemas cannot see, kept in one place so create, edit and
// CSV import apply the same ones.

/** The kinds of the site's areas, by id (a site has a handful). */
export async function siteAreaKinds(siteId: string): Promise<Map<string, string>> {
  const rows = await useDb().select({ id: tables.areas.id, kind: tables.areas.kind }).from(tables.areas).where(eq(tables.areas.siteId, siteId))
  return new Map(rows.map(r => [r.id, r.kind]))
}

// Each rule's English words by its code (refusal.<code>), so a refusal carries the code of its first problem.
const RULE_WORDS = {
  area_missing: 'Pick an area at this site.',
  charging_area_needed: 'Pick a charging area.',
  fuel_station_needed: 'Pick a fuel station.',
  cylinder_status_by_exchange: 'A cylinder goes on and off a truck through a cylinder exchange.',
}

// The rules a schema cannot see, the same for create, edit and CSV import: an area reference points at an
// area of this site and of the right kind; a cylinder goes in use (and out of it) only through an exchange.
// Answers field → message; empty when the values keep the rules.
export function assetRuleProblems(kind: AssetKind, values: Record<string, unknown>, areaKinds: Map<string, string>, current?: Record<string, unknown>): Record<string, string> {
  const problems: Record<string, string> = {}
  for (const [field, areaKind] of Object.entries(assetKinds()[kind].areaRefs)) {
    const areaId = values[field]
    if (!areaId) continue
    const found = areaKinds.get(String(areaId))
    if (!found) problems[field] = RULE_WORDS.area_missing
    else if (areaKind && found !== areaKind) problems[field] = areaKind === 'charging_area' ? RULE_WORDS.charging_area_needed : RULE_WORDS.fuel_station_needed
  }
  if (kind === 'cylinder' && values.status !== undefined && values.status !== current?.status && (values.status === 'in_use' || current?.status === 'in_use')) {
    problems.status = RULE_WORDS.cylinder_status_by_exchange
  }
  return problems
}

export function refuseRuleProblems(problems: Record<string, string>) {
  const codeOf = (words: string) => Object.entries(RULE_WORDS).find(([, w]) => w === words)?.[0] ?? 'check_fields'
  const first = Object.values(problems)[0]
  if (first) throw codedError(400, codeOf(first), first, { fields: problems, fieldCodes: Object.fromEntries(Object.entries(problems).map(([f, words]) => [f, { code: codeOf(words) }])) })
}

// A condemned cylinder stays condemned: changing its status needs a lead (cylinder.uncondemn) and the
// reason written down (`statusReason`, kept as the audit note). Answers that reason, or undefined.
export function reviveCondemned(actor: Actor, kind: AssetKind, row: Record<string, unknown> & { siteId: string }, nextStatus: unknown, statusReason: unknown): string | undefined {
  if (kind !== 'cylinder' || row.status !== 'condemned' || nextStatus === undefined || nextStatus === 'condemned') return undefined
  requireActorCan(actor, 'cylinder.uncondemn', row.siteId)
  const reason = typeof statusReason === 'string' ? statusReason.trim() : ''
  if (reason.length < 10) {
    const msg = 'This cylinder is condemned. To return it to use, write down why the condemnation was wrong (statusReason, 10 characters or more).'
    throw codedError(400, 'condemned_reason_needed', msg, { fields: { statusReason: 'Say why it may be used again.' } })
  }
  return `Condemned cylinder returned to ${String(nextStatus)}: ${reason.slice(0, 500)}`
}
