import * as schema from '../../server/database/schema'

type Insert<T extends { $inferInsert: unknown }> = T['$inferInsert']

// Everything the seed writes, collected in memory first and inserted table by table in this order.
export const SEED_TABLES = {
  organizations: schema.organizations,
  sites: schema.sites,
  users: schema.users,
  memberships: schema.memberships,
  qualifications: schema.qualifications,
  areas: schema.areas,
  trucks: schema.trucks,
  batteries: schema.batteries,
  chargers: schema.chargers,
  lpCylinders: schema.lpCylinders,
  tags: schema.tags,
  tagCounters: schema.tagCounters,
  auditLog: schema.auditLog,
  batterySwaps: schema.batterySwaps,
  chargeSessions: schema.chargeSessions,
  electrolyteChecks: schema.electrolyteChecks,
  cellReadings: schema.cellReadings,
  assetHolds: schema.assetHolds,
  uploads: schema.uploads,
  requalifications: schema.requalifications,
  cylinderExchanges: schema.cylinderExchanges,
  cylinderRefills: schema.cylinderRefills,
  emissionsTests: schema.emissionsTests,
  coReadings: schema.coReadings,
  checklistTemplates: schema.checklistTemplates,
  areaLogs: schema.areaLogs,
  areaLogEntries: schema.areaLogEntries,
  incidents: schema.incidents,
  followUps: schema.followUps,
  truckInspectionTemplates: schema.truckInspectionTemplates,
  truckInspections: schema.truckInspections,
} as const

export type SeedTableName = keyof typeof SEED_TABLES
export type SeedRows = { [K in SeedTableName]: Insert<typeof SEED_TABLES[K]>[] }

export function emptySeedRows(): SeedRows {
  const rows = {} as Record<SeedTableName, unknown[]>
  for (const name of Object.keys(SEED_TABLES) as SeedTableName[]) rows[name] = []
  return rows as SeedRows
}

export type TruckRow = Insert<typeof schema.trucks> & { id: string, siteId: string }
export type BatteryRow = Insert<typeof schema.batteries> & { id: string, siteId: string }
export type ChargerRow = Insert<typeof schema.chargers> & { id: string, siteId: string }
export type CylinderRow = Insert<typeof schema.lpCylinders> & { id: string, siteId: string }
export type AreaRow = Insert<typeof schema.areas> & { id: string, siteId: string }
