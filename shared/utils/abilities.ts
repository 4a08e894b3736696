import { ROLES, ROLE_LABELS, type Role } from '../types/auth'

// The one permissions map: who may do what. The server's guard (`requireAbility`), the navigation, the
// tag page's actions and every role check on a screen read it; every route file declares its ability
// with `defineAbilityHandler('<ability>', …)`, and the role × route matrix test (tests/e2e/access-matrix)
// checks each route against this map. Role lists appear nowhere else.
//
// Scopes:
// - public     anyone, signed in or not (the route checks its own secret: a password link, a calendar token)
// - signed-in  any signed-in person, for their own account and what they started (feeds, jobs)
// - site       the listed roles at the site the record belongs to; not a member there → 404, a member
//              without one of the roles → 403
// - any-site   the listed roles at any one of the person's sites
export type AbilityScope = 'public' | 'signed-in' | 'site' | 'any-site'

export interface AbilityRule {
  scope: AbilityScope
  roles: readonly Role[]
  /** what it lets one do, after "to …" in a refusal */
  does: string
}

const EVERYONE: readonly Role[] = ROLES
const FLOOR: readonly Role[] = ['technician', 'facilities_lead', 'safety_lead', 'admin']
const LEADS: readonly Role[] = ['facilities_lead', 'safety_lead', 'admin']
const ADMINS: readonly Role[] = ['admin']

const open = (does: string): AbilityRule => ({ scope: 'public', roles: EVERYONE, does })
const self = (does: string): AbilityRule => ({ scope: 'signed-in', roles: EVERYONE, does })
const at = (roles: readonly Role[], does: string): AbilityRule => ({ scope: 'site', roles, does })

export const ABILITIES = {
  // public: no session needed
  'health.check': open('check that the server answers'),
  'auth.sign-in': open('sign in'),
  'auth.sign-out': open('sign out'),
  'auth.password-reset': open('set a new password through an e-mailed link'),
  'calendar.feed': open('read a due-list calendar through its private link'),

  // any signed-in person, for themselves
  'account.self': self('see and change your own account, calendar feeds and jobs'),

  // at the site of the record
  'site.member': at(EVERYONE, 'see this site\'s records'),
  'swap.record': at(EVERYONE, 'change a truck\'s battery'),
  'swap.override': at(FLOOR, 'override a refused battery check with a written reason'),
  'charge.record': at(FLOOR, 'put a battery on or off charge'),
  'reading.record': at(FLOOR, 'record an electrolyte check or watering'),
  'refill.record': at(FLOOR, 'refill LP cylinders (a current LP-gas transfer qualification is checked too)'),
  'cylinder.exchange': at(EVERYONE, 'change a truck\'s LP cylinder'),
  'cylinder.quarantine': at(FLOOR, 'quarantine a cylinder'),
  'cylinder.requalify': at(FLOOR, 'record a cylinder requalification'),
  'cylinder.uncondemn': at(LEADS, 'return a condemned cylinder to use, with the reason'),
  'co.record': at(['technician', 'safety_lead', 'admin'], 'record indoor CO readings'),
  'co.view': at(FLOOR, 'see indoor CO readings'),
  'emissions.record': at(['facilities_lead', 'admin'], 'record emissions tests'),
  'emissions.view': at(LEADS, 'see the emissions overview'),
  'incident.report': at(EVERYONE, 'report an incident'),
  'incident.view': at(LEADS, 'see the incidents'),
  'log.view': at(FLOOR, 'see area logs, their reports and follow-ups'),
  'log.record': at(FLOOR, 'fill in or correct area logs'),
  'record.correct-late': at(LEADS, 'correct a record after the site\'s correction window'),
  'log.sign': at(['safety_lead'], 'sign area logs'),
  'checklist.edit': at(LEADS, 'change the area checklists'),
  'followup.close': at(LEADS, 'close someone else\'s follow-up'),
  'due.view-all': at(LEADS, 'see every role\'s due list'),
  'schedule.edit': at(LEADS, 'change the due schedules and add the site\'s own'),
  'schedule.complete': at(FLOOR, 'record a scheduled task done'),
  'asset.edit': at(LEADS, 'add, edit or import asset records'),
  'asset.hold': at(FLOOR, 'take an asset out of service or return it'),
  'tag.retag': at(LEADS, 're-tag an asset'),
  'label.print': at(LEADS, 'print label sheets'),
  'report.view': at(LEADS, 'see the ventilation check, the overrides report and the compliance report'),
  'report.fleet': at(['facilities_lead', 'admin'], 'see the energy, battery, replacement, fleet-sizing and propane reports'),
  'audit-pack.make': at(LEADS, 'make an audit pack of the site\'s records for an inspector'),
  'upload.create': at(EVERYONE, 'upload a certificate or photo'),
  'user.view': at(LEADS, 'see the people of the site'),
  'user.manage': at(ADMINS, 'add people, change their accounts or send them a password link'),
  'role.assign': at(ADMINS, 'change people\'s roles'),
  'qualification.grant': at(['safety_lead', 'admin'], 'record someone else\'s training and evaluation'),
  'mail.manage': at(ADMINS, 'see and resend the site\'s mail'),
  'site.edit': at(ADMINS, 'change the site\'s settings'),
  'site.tariff': at(['facilities_lead', 'admin'], 'set the site\'s electricity prices and peak hours'),
  'site.create': { scope: 'any-site', roles: ADMINS, does: 'add a site' },

  // pre-shift truck inspection and who may drive (29 CFR 1910.178(q)(7), (l)(4))
  'inspection.record': at(EVERYONE, 'record a truck\'s pre-shift inspection'),
  'inspection.return': at(FLOOR, 'return a truck to service after a failed inspection, saying what was done'),
  'inspection.template-edit': at(LEADS, 'change the pre-shift truck checklists'),
  'retraining.record': at(['safety_lead', 'admin'], 'record an event that calls for an operator\'s retraining'),

  // who is told (alerts and digests go to the holders at the site)
  'notice.checklist-failed': at(['safety_lead'], 'be told of a failed checklist item'),
  'notice.incident': at(['safety_lead'], 'be told of an incident'),
  'notice.emissions-failed': at(['facilities_lead', 'safety_lead'], 'be told of a failed emissions test'),
  'notice.cylinder-refused': at(['safety_lead', 'facilities_lead'], 'be told of a refused cylinder fill'),
  'notice.co-ceiling': at(['safety_lead'], 'be told of CO above the ceiling'),
  'notice.digest': at(['facilities_lead', 'safety_lead'], 'get the daily due-list digest'),
  'notice.truck-hold': at(['facilities_lead', 'safety_lead'], 'be told of a truck taken out of service by its inspection'),
} as const satisfies Record<string, AbilityRule>

export type Ability = keyof typeof ABILITIES
export const ABILITY_NAMES = Object.keys(ABILITIES) as Ability[]

export function isAbility(name: string): name is Ability {
  return Object.hasOwn(ABILITIES, name)
}

/** Whether someone holding `roles` at a site has the ability there (public and signed-in ones: always). */
export function can(roles: readonly Role[], ability: Ability): boolean {
  const rule: AbilityRule = ABILITIES[ability]
  if (rule.scope === 'public' || rule.scope === 'signed-in') return true
  return roles.some(r => rule.roles.includes(r))
}

/** The roles that hold an ability at a site (for alert recipients and listings). */
export function rolesWith(ability: Ability): readonly Role[] {
  return ABILITIES[ability].roles
}

/** "Technician, Facilities lead or Admin". */
export function roleNames(roles: readonly Role[]): string {
  const labels = roles.map(r => ROLE_LABELS[r])
  return labels.length > 1 ? `${labels.slice(0, -1).join(', ')} or ${labels.at(-1)}` : labels[0] ?? 'nobody'
}

/** Who holds an ability, in words (README's security table is checked against this). */
export function whoHolds(ability: Ability): string {
  const rule: AbilityRule = ABILITIES[ability]
  if (rule.scope === 'public') return 'anyone'
  if (rule.scope === 'signed-in') return 'anyone signed in'
  const who = rule.roles.length === ROLES.length ? 'anyone with a role at the site' : roleNames(rule.roles)
  return rule.scope === 'any-site' ? `${who} (at any of their sites)` : who
}

/** The plain refusal of a member who lacks the ability. */
export function refusalFor(ability: Ability): string {
  const rule: AbilityRule = ABILITIES[ability]
  return `To ${rule.does} you need one of these roles at this site: ${roleNames(rule.roles)}.`
}
