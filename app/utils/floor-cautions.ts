import type { CorrectableKind } from '#shared/utils/correction-schemas'

// The two or three cautions that fit each floor action (product.md, "Cautions shown in context"); one list
// per action, shown in the form's header. Each is a key of i18n/locales (caution.<action>.<what>): UiCautions
// shows it in the reader's language.
export const FLOOR_CAUTIONS = {
  swap: ['caution.swap.brake_set', 'caution.swap.lifting_rated', 'caution.swap.secured'],
  charge: ['caution.charge.charger_off', 'caution.charge.vent_caps', 'caution.charge.no_smoking'],
  water: ['caution.water.face_shield', 'caution.water.eyewash', 'caution.water.no_metal'],
  lpChange: ['caution.lp_change.engine_off', 'caution.lp_change.gloves', 'caution.lp_change.relief_valve'],
  lpRefill: ['caution.lp_refill.filling_area', 'caution.lp_refill.gloves'],
  requalify: ['caution.requalify.not_filled', 'caution.requalify.condemned'],
  emissions: ['caution.emissions.outdoors', 'caution.emissions.tailpipe'],
  co: ['caution.co.ventilation', 'caution.co.above_200'],
} as const satisfies Record<string, readonly string[]>

/** What a "Correct this" form shows: a correction changes the record, not the floor; then the kind's own. */
export const CORRECTION_CAUTIONS = {
  'battery-swap': ['caution.correction.record_first', 'caution.correction.battery_swap'],
  'charge-session': ['caution.correction.record_first', 'caution.correction.charge_session'],
  'electrolyte-check': ['caution.correction.record_first', 'caution.correction.electrolyte_check'],
  'cylinder-refill': ['caution.correction.record_first', 'caution.correction.cylinder_refill'],
  'cylinder-exchange': ['caution.correction.record_first', 'caution.correction.cylinder_exchange'],
  'requalification': ['caution.correction.record_first', 'caution.correction.requalification'],
  'emissions-test': ['caution.correction.record_first', 'caution.correction.emissions_test'],
  'co-reading': ['caution.correction.record_first', 'caution.correction.co_reading'],
} as const satisfies Record<CorrectableKind, readonly string[]>
