import { pgEnum } from 'drizzle-orm/pg-core'
import { ROLES } from '../../../shared/types/auth'

export const roleEnum = pgEnum('role', ROLES)
export const areaKindEnum = pgEnum('area_kind', ['charging_area', 'fuel_station'])
export const unitSystemEnum = pgEnum('unit_system', ['us', 'metric'])
export const qualificationKindEnum = pgEnum('qualification_kind', [
  'truck_class_1', 'truck_class_2', 'truck_class_3', 'truck_class_4', 'truck_class_5', 'truck_class_6', 'truck_class_7',
  'battery_changing', 'lp_gas_transfer',
])
export const truckPowerEnum = pgEnum('truck_power', ['electric', 'lp_gas', 'gasoline', 'diesel'])
export const batteryChemistryEnum = pgEnum('battery_chemistry', ['flooded_lead_acid', 'agm', 'gel', 'lithium_ion'])
export const chargerTypeEnum = pgEnum('charger_type', ['iu', 'iui', 'taper', 'lithium'])
export const cylinderSpecEnum = pgEnum('cylinder_spec', ['dot_4bw', 'dot_4e', 'tc_4bwm', 'tc_4em'])
export const cylinderStatusEnum = pgEnum('cylinder_status', ['full', 'empty', 'in_use', 'quarantined', 'condemned'])
export const requalMethodEnum = pgEnum('requal_method', ['water_jacket', 'proof_pressure', 'external_visual'])
export const assetKindEnum = pgEnum('asset_kind', ['battery', 'charger', 'cylinder', 'truck', 'area'])
export const electrolyteLevelEnum = pgEnum('electrolyte_level', ['low', 'ok', 'high'])
export const readingScopeEnum = pgEnum('reading_scope', ['pilot_cell', 'every_cell'])
export const chargeOutcomeEnum = pgEnum('charge_outcome', ['complete', 'interrupted'])
export const holdActionEnum = pgEnum('hold_action', ['hold', 'release'])
export const checklistCadenceEnum = pgEnum('checklist_cadence', ['daily', 'weekly'])
export const checkResultEnum = pgEnum('check_result', ['pass', 'fail', 'not_applicable'])
export const scheduleRuleEnum = pgEnum('schedule_rule', ['days', 'charges', 'hours', 'date_rule'])
export const incidentKindEnum = pgEnum('incident_kind', [
  'electrolyte_spill', 'damaged_battery', 'cylinder_leak', 'cylinder_damage', 'fire', 'near_miss', 'other',
])
export const mailStatusEnum = pgEnum('mail_status', ['queued', 'sent', 'failed'])
