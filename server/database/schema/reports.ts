import { doublePrecision, jsonb, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { sites } from './core'

// The energy report's closed months: one row per site and month of the site's calendar, holding that
// month's standing, closed charges per charger and its kWh in peak windows. Filled the first time a report
// covers the whole month after it has ended (server/utils/reports/charge-months.ts); a trigger on
// charge_sessions drops the row when a record of that month is added, ended or corrected, so the next report
// fills it again from the records. The time zone and peak windows it was made with are kept: a row made
// under other settings is made again. Nothing else reads or writes it.
export const chargeMonthRollups = pgTable('charge_month_rollups', {
  siteId: uuid().notNull().references(() => sites.id),
  /** 'YYYY-MM' in the site's time zone */
  month: text().notNull(),
  /** { "<charger id>": [charges, grid kWh, energy cost, hours on charge] } */
  chargers: jsonb().$type<Record<string, [number, number, number, number]>>().notNull(),
  kwh: doublePrecision().notNull(),
  peakKwh: doublePrecision().notNull(),
  /** when the month's last counted charge ended (a report whose range ends before it counts from the records) */
  latestEnd: timestamp({ withTimezone: true }),
  timeZone: text().notNull(),
  peakPeriods: jsonb().notNull(),
  madeAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
}, t => [primaryKey({ columns: [t.siteId, t.month] })])
