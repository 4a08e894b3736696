import { boolean, date, doublePrecision, index, integer, pgTable, smallint, text, uniqueIndex, uuid, timestamp, check } from 'drizzle-orm/pg-core'
import { sql } from 'drizzle-orm'
import { batteryChemistryEnum, chargerTypeEnum, cylinderSpecEnum, cylinderStatusEnum, requalMethodEnum, truckPowerEnum } from './enums'
import { areas, sites } from './core'
import { id, timestamps } from './shared'

// Fields every asset shares: its site, out-of-service hold, notes.
const assetBase = () => ({
  id: id(),
  siteId: uuid().notNull().references(() => sites.id),
  outOfService: boolean().notNull().default(false),
  outOfServiceReason: text(),
  notes: text().notNull().default(''),
  ...timestamps,
})

export const trucks = pgTable('trucks', {
  ...assetBase(),
  fleetNumber: text().notNull(),
  truckClass: smallint().notNull(),
  power: truckPowerEnum().notNull(),
  model: text().notNull().default(''),
  homeAreaId: uuid().references(() => areas.id),
  systemVoltage: integer(),
  compartmentLengthIn: doublePrecision(),
  compartmentWidthIn: doublePrecision(),
  compartmentHeightIn: doublePrecision(),
  minBatteryWeightLb: doublePrecision(),
  maxBatteryWeightLb: doublePrecision(),
  connector: text(),
  allowedChemistries: batteryChemistryEnum().array().notNull().default(sql`'{}'`),
  /** the hour meter as registered (or last set by hand); the current reading is truck_status.hour_meter */
  hourMeter: doublePrecision().notNull().default(0),
}, t => [
  uniqueIndex().on(t.siteId, t.fleetNumber),
  index().on(t.siteId, t.power),
  index().on(t.homeAreaId),
  check('trucks_class_range', sql`${t.truckClass} BETWEEN 1 AND 7`),
])

export const batteries = pgTable('batteries', {
  ...assetBase(),
  serial: text().notNull(),
  homeAreaId: uuid().references(() => areas.id),
  chemistry: batteryChemistryEnum().notNull(),
  voltage: integer().notNull(),
  cellCount: integer().notNull(),
  capacityAh: integer().notNull(),
  capacityHourRate: smallint().notNull().default(6),
  weightLb: doublePrecision().notNull(),
  lengthIn: doublePrecision().notNull(),
  widthIn: doublePrecision().notNull(),
  heightIn: doublePrecision().notNull(),
  connector: text().notNull(),
  manufacturedOn: date(),
  inServiceOn: date(),
  ratedCycles: integer().notNull().default(1500),
  /** what a like-for-like replacement costs, in the site's currency (entered by a lead; the forecast sums it) */
  replacementPrice: doublePrecision(),
}, t => [
  uniqueIndex().on(t.siteId, t.serial),
  index().on(t.siteId, t.chemistry),
  index().on(t.siteId, t.voltage),
  index().on(t.homeAreaId),
])

export const chargers = pgTable('chargers', {
  ...assetBase(),
  name: text().notNull(),
  serial: text().notNull().default(''),
  areaId: uuid().notNull().references(() => areas.id),
  chargerType: chargerTypeEnum().notNull(),
  outputVoltage: integer().notNull(),
  maxCurrentA: doublePrecision().notNull(),
  minCapacityAh: integer().notNull(),
  maxCapacityAh: integer().notNull(),
  chemistryProfiles: batteryChemistryEnum().array().notNull(),
  efficiency: doublePrecision().notNull().default(0.85),
  gassingCurrentA: doublePrecision(),
}, t => [uniqueIndex().on(t.siteId, t.name), index().on(t.areaId)])

export const lpCylinders = pgTable('lp_cylinders', {
  ...assetBase(),
  serial: text().notNull(),
  areaId: uuid().references(() => areas.id),
  specification: cylinderSpecEnum().notNull(),
  waterCapacityLb: doublePrecision().notNull(),
  tareLb: doublePrecision().notNull(),
  nominalPropaneLb: doublePrecision().notNull(),
  manufactureYear: smallint().notNull(),
  manufactureMonth: smallint().notNull(),
  lastRequalifiedOn: date(),
  lastRequalificationMethod: requalMethodEnum(),
  status: cylinderStatusEnum().notNull().default('empty'),
  currentTruckId: uuid().references(() => trucks.id),
  statusChangedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [
  uniqueIndex().on(t.siteId, t.serial),
  index().on(t.siteId, t.status),
  index().on(t.areaId, t.status),
  uniqueIndex('cylinders_one_per_truck').on(t.currentTruckId).where(sql`${t.currentTruckId} IS NOT NULL`),
  check('cylinders_month_range', sql`${t.manufactureMonth} BETWEEN 1 AND 12`),
])
