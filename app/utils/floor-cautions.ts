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
