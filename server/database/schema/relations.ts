import { relations } from 'drizzle-orm'
import { areas, memberships, organizations, qualifications, sites, tags, users } from './core'
import { batteries, chargers, lpCylinders, trucks } from './assets'
import { batterySwaps, cellReadings, chargeSessions, electrolyteChecks } from './battery-room'
import { cylinderExchanges, cylinderRefills, emissionsTests, requalifications } from './fuel'

export const organizationsRelations = relations(organizations, ({ many }) => ({ sites: many(sites) }))
export const sitesRelations = relations(sites, ({ one, many }) => ({
  organization: one(organizations, { fields: [sites.organizationId], references: [organizations.id] }),
  areas: many(areas),
  memberships: many(memberships),
}))
export const areasRelations = relations(areas, ({ one, many }) => ({
  site: one(sites, { fields: [areas.siteId], references: [sites.id] }),
  chargers: many(chargers),
}))
export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(memberships),
  qualifications: many(qualifications),
}))
export const membershipsRelations = relations(memberships, ({ one }) => ({
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
  site: one(sites, { fields: [memberships.siteId], references: [sites.id] }),
}))
export const qualificationsRelations = relations(qualifications, ({ one }) => ({
  user: one(users, { fields: [qualifications.userId], references: [users.id] }),
}))
export const tagsRelations = relations(tags, ({ one }) => ({
  site: one(sites, { fields: [tags.siteId], references: [sites.id] }),
}))
export const trucksRelations = relations(trucks, ({ one }) => ({
  site: one(sites, { fields: [trucks.siteId], references: [sites.id] }),
  homeArea: one(areas, { fields: [trucks.homeAreaId], references: [areas.id] }),
}))
export const batteriesRelations = relations(batteries, ({ one, many }) => ({
  site: one(sites, { fields: [batteries.siteId], references: [sites.id] }),
  homeArea: one(areas, { fields: [batteries.homeAreaId], references: [areas.id] }),
  chargeSessions: many(chargeSessions),
  electrolyteChecks: many(electrolyteChecks),
}))
export const chargersRelations = relations(chargers, ({ one }) => ({
  site: one(sites, { fields: [chargers.siteId], references: [sites.id] }),
  area: one(areas, { fields: [chargers.areaId], references: [areas.id] }),
}))
export const lpCylindersRelations = relations(lpCylinders, ({ one, many }) => ({
  site: one(sites, { fields: [lpCylinders.siteId], references: [sites.id] }),
  area: one(areas, { fields: [lpCylinders.areaId], references: [areas.id] }),
  refills: many(cylinderRefills),
  requalifications: many(requalifications),
}))
export const batterySwapsRelations = relations(batterySwaps, ({ one }) => ({
  truck: one(trucks, { fields: [batterySwaps.truckId], references: [trucks.id] }),
  user: one(users, { fields: [batterySwaps.userId], references: [users.id] }),
}))
export const chargeSessionsRelations = relations(chargeSessions, ({ one }) => ({
  battery: one(batteries, { fields: [chargeSessions.batteryId], references: [batteries.id] }),
  charger: one(chargers, { fields: [chargeSessions.chargerId], references: [chargers.id] }),
}))
export const electrolyteChecksRelations = relations(electrolyteChecks, ({ one, many }) => ({
  battery: one(batteries, { fields: [electrolyteChecks.batteryId], references: [batteries.id] }),
  cells: many(cellReadings),
}))
export const cellReadingsRelations = relations(cellReadings, ({ one }) => ({
  check: one(electrolyteChecks, { fields: [cellReadings.checkId], references: [electrolyteChecks.id] }),
}))
export const cylinderRefillsRelations = relations(cylinderRefills, ({ one }) => ({
  cylinder: one(lpCylinders, { fields: [cylinderRefills.cylinderId], references: [lpCylinders.id] }),
}))
export const cylinderExchangesRelations = relations(cylinderExchanges, ({ one }) => ({
  truck: one(trucks, { fields: [cylinderExchanges.truckId], references: [trucks.id] }),
}))
export const requalificationsRelations = relations(requalifications, ({ one }) => ({
  cylinder: one(lpCylinders, { fields: [requalifications.cylinderId], references: [lpCylinders.id] }),
}))
export const emissionsTestsRelations = relations(emissionsTests, ({ one }) => ({
  truck: one(trucks, { fields: [emissionsTests.truckId], references: [trucks.id] }),
}))
