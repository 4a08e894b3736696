// `npm run bench:data`: a fleet-scale database (bayward_bench) built with PostgreSQL's bulk paths
// (INSERT … SELECT generate_series), for the benchmark in scripts/bench/run.ts.
import { execFileSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import postgres from 'postgres'
import { Hash } from '@adonisjs/hash'
import { Scrypt } from '@adonisjs/hash/drivers/scrypt'
import { defaultSiteSettings } from '../../shared/utils/site-settings'
import { PREFILL_INSPECTION_ITEMS } from '../../shared/utils/lp-gas'
import { CHARGING_AREA_ITEMS, FUEL_STATION_ITEMS } from '../seed/area-logs'
import { drizzle } from 'drizzle-orm/postgres-js'
import * as schema from '../../server/database/schema'
import { rebuildReadModels } from '../../server/utils/due/rebuild'
import { BENCH, benchDatabaseUrl, benchId } from './shape'

const root = fileURLToPath(new URL('../..', import.meta.url))
const started = Date.now()
const elapsed = () => `${((Date.now() - started) / 1000).toFixed(1)} s`
const log = (what: string) => console.log(`[${elapsed().padStart(7)}] ${what}`)

const { sites: SITES, batteriesPerSite: BPS, trucksPerSite: TPS, electricPerSite: EPS, cylindersPerSite: CPS, chargersPerArea: CPA } = BENCH
const HISTORY = { chargesPerBattery: 40, swapsPerTruck: 100, checksPerBattery: 12, refillsPerCylinder: 30, exchangesPerTruck: 150, emissionsPerTruck: 6, logDays: 1095, entriesPerLog: 3 }

const url = benchDatabaseUrl()
const database = new URL(url).pathname.slice(1)
const dbEnv = { ...process.env, BAYWARD_PG_PORT: new URL(url).port || '54329' }
execFileSync('bash', ['scripts/db.sh', 'drop-db', database], { cwd: root, env: dbEnv, stdio: 'inherit' })
execFileSync('bash', ['scripts/db.sh', 'create-db', database], { cwd: root, env: dbEnv, stdio: 'inherit' })
execFileSync('node', ['scripts/migrate.mjs'], { cwd: root, env: { ...process.env, NUXT_DATABASE_URL: url }, stdio: 'inherit' })
log(`created and migrated ${database}`)

const sql = postgres(url, { max: 1, onnotice: () => {}, connection: { application_name: 'bayward-bench-data' } })
const run = (text: string) => sql.unsafe(text)

// Fixed "now" of the data set; the benchmark runs soon after, so states (cooling, ready) hold for hours.
const t0 = new Date().toISOString()
const T0 = `'${t0}'::timestamptz`
const lit = (v: unknown) => `'${JSON.stringify(v).replace(/'/g, '\'\'')}'`
const uid = (expr: string) => `overlay(overlay(md5(${expr}) placing '4' from 13) placing '8' from 17)::uuid`
// Ids are md5 of a readable key (version and variant digits set, as zod's uuid check wants), so any statement can name a row of another table without a look-up.
const siteId = (s: string) => uid(`'site:' || ${s}`)
const areaId = (s: string, a: string) => uid(`'area:' || ${s} || ':' || ${a}`)
const userId = (s: string, role: string) => uid(`'user:' || ${s} || ':' || ${role}`)
const batteryId = (i: string) => uid(`'battery:' || ${i}`)
const truckId = (j: string) => uid(`'truck:' || ${j}`)
const chargerId = (s: string, a: string, c: string) => uid(`'charger:' || ${s} || ':' || ${a} || ':' || ${c}`)
const cylinderId = (k: string) => uid(`'cylinder:' || ${k}`)
const templateId = (s: string, kind: string) => uid(`'template:' || ${s} || ':' || ${kind}`)
const pad = (v: string, n: number) => `lpad((${v})::text, ${n}, '0')`

try {
  await run(`SET maintenance_work_mem = '256MB'`)
  await run(`SET synchronous_commit = off`)
  await run(`SET work_mem = '64MB'`)

  // Bulk loads go fastest into bare tables: drop foreign keys and secondary indexes, put them back at the end.
  const fks = await sql<{ tbl: string, name: string, def: string }[]>`
    SELECT conrelid::regclass::text AS tbl, conname AS name, pg_get_constraintdef(oid) AS def
    FROM pg_constraint WHERE contype = 'f' AND connamespace = 'public'::regnamespace`
  const indexes = await sql<{ name: string, def: string }[]>`
    SELECT indexname AS name, indexdef AS def FROM pg_indexes
    WHERE schemaname = 'public' AND indexname NOT IN (SELECT conname FROM pg_constraint WHERE contype IN ('p', 'u'))`
  for (const fk of fks) await run(`ALTER TABLE ${fk.tbl} DROP CONSTRAINT "${fk.name}"`)
  for (const ix of indexes) await run(`DROP INDEX "${ix.name}"`)
  log(`dropped ${fks.length} foreign keys and ${indexes.length} indexes for the load`)

  const hash = await new Hash(new Scrypt({})).make(BENCH.password)
  const settings = lit(defaultSiteSettings())

  await run(`INSERT INTO organizations (id, name) VALUES (${uid(`'org'`)}, 'Larkfield Distribution Group')`)
  await run(`
    INSERT INTO sites (id, organization_id, name, address, time_zone, settings)
    SELECT ${siteId('s')}, ${uid(`'org'`)}, 'Larkfield DC ' || ${pad('s', 2)}, s || ' Depot Road', 'America/Chicago', ${settings}::jsonb
    FROM generate_series(1, ${SITES}) s`)
  // Areas 1–3 are charging rooms, 4 the fuel cage.
  await run(`
    INSERT INTO areas (id, site_id, kind, name, floor_area_ft2, room_volume_ft3, installed_exhaust_cfm, lp_storage_limit_lb)
    SELECT ${areaId('s', 'a')}, ${siteId('s')},
      (CASE WHEN a = 4 THEN 'fuel_station' ELSE 'charging_area' END)::area_kind,
      CASE a WHEN 1 THEN 'Charge room A' WHEN 2 THEN 'Charge room B' WHEN 3 THEN 'Charge room C' ELSE 'Fuel cage' END,
      CASE WHEN a = 4 THEN NULL ELSE 4000 END, CASE WHEN a = 4 THEN NULL ELSE 80000 END, CASE WHEN a = 4 THEN NULL ELSE 12000 END,
      CASE WHEN a = 4 THEN 2500 END
    FROM generate_series(1, ${SITES}) s, generate_series(1, 4) a`)

  // People: one user per role per site, a lead over the first sites and a floor operator at site 1.
  await run(`
    INSERT INTO users (id, email, name, password_hash)
    SELECT ${userId('s', 'r')}, r || '.' || ${pad('s', 2)} || '@larkfield.example.test', initcap(replace(r, '_', ' ')) || ' ' || ${pad('s', 2)}, '${hash}'
    FROM generate_series(1, ${SITES}) s, unnest(enum_range(NULL::role)::text[]) r`)
  await run(`
    INSERT INTO memberships (user_id, site_id, role)
    SELECT ${userId('s', 'r')}, ${siteId('s')}, r::role FROM generate_series(1, ${SITES}) s, unnest(enum_range(NULL::role)::text[]) r`)
  await run(`
    INSERT INTO users (id, email, name, password_hash) VALUES
      (${uid(`'user:lead'`)}, '${BENCH.leadEmail}', 'Regional lead', '${hash}'),
      (${uid(`'user:floor'`)}, '${BENCH.floorEmail}', 'Floor operator', '${hash}'),
      (${uid(`'user:shift'`)}, '${BENCH.shiftEmail}', 'Shift crew', '${hash}')`)
  await run(`
    INSERT INTO memberships (user_id, site_id, role)
    SELECT ${uid(`'user:lead'`)}, ${siteId('s')}, r::role
    FROM generate_series(1, ${BENCH.leadSites}) s, unnest(ARRAY['operator', 'technician', 'facilities_lead', 'safety_lead']) r
    UNION ALL SELECT ${uid(`'user:floor'`)}, ${siteId('1')}, 'operator'
    UNION ALL SELECT ${uid(`'user:shift'`)}, ${siteId('s')}, r::role FROM generate_series(1, ${SITES}) s, unnest(ARRAY['operator', 'technician']) r`)
  await run(`
    INSERT INTO qualifications (user_id, kind, trained_on, evaluated_on, expires_on)
    SELECT id, 'battery_changing', (${T0} - interval '400 days')::date, (${T0} - interval '400 days')::date, (${T0} + interval '700 days')::date
    FROM users WHERE email LIKE 'operator.%' OR email LIKE 'technician.%' OR id IN (${uid(`'user:lead'`)}, ${uid(`'user:floor'`)}, ${uid(`'user:shift'`)})`)
  log('organisation, sites, areas, people')

  // A map of every battery: site s, position p (0–499), home room a; the first EPS positions sit in trucks.
  await run(`
    CREATE TEMP TABLE bmap AS
    SELECT i, s, p, a, ${batteryId('i')} AS id, ${siteId('s')} AS site_id, ${userId('s', `'technician'`)} AS tech,
      (CASE WHEN s % 2 = 0 THEN 48 ELSE 36 END) AS volt, (ARRAY[765, 850, 930])[p % 3 + 1] AS cap,
      CASE WHEN a = 1 THEN 0 WHEN a = 2 THEN 200 ELSE 350 END AS area_start
    FROM (SELECT i, i / ${BPS} + 1 AS s, i % ${BPS} AS p,
                 CASE WHEN i % ${BPS} < 200 THEN 1 WHEN i % ${BPS} < 350 THEN 2 ELSE 3 END AS a
          FROM generate_series(0, ${SITES * BPS - 1}) i) x`)
  await run(`CREATE TEMP TABLE tmap AS
    SELECT j, j / ${TPS} + 1 AS s, j % ${TPS} AS q, ${truckId('j')} AS id, ${siteId(`(j / ${TPS} + 1)`)} AS site_id
    FROM generate_series(0, ${SITES * TPS - 1}) j`)

  // Site groups: even sites run 48 V counterbalanced trucks, odd sites 36 V reach trucks (invented nameplates).
  const spec = (s: string, even: string, odd: string) => `CASE WHEN ${s} % 2 = 0 THEN ${even} ELSE ${odd} END`
  await run(`
    INSERT INTO trucks (id, site_id, fleet_number, truck_class, power, model, home_area_id, system_voltage,
      compartment_length_in, compartment_width_in, compartment_height_in, min_battery_weight_lb, max_battery_weight_lb,
      connector, allowed_chemistries, hour_meter)
    SELECT id, site_id, 'LK' || ${pad('s', 2)} || '-' || ${pad('q + 1', 3)},
      CASE WHEN q < ${EPS} THEN ${spec('s', '1', '2')} ELSE 4 END,
      (CASE WHEN q < ${EPS} THEN 'electric' ELSE 'lp_gas' END)::truck_power,
      CASE WHEN q < ${EPS} THEN ${spec('s', `'Electric counterbalanced, 5,000 lb, 48 V'`, `'Narrow-aisle reach truck, 4,500 lb, 36 V'`)} ELSE 'LP-gas counterbalanced, cushion tyres, 5,000 lb' END,
      ${areaId('s', `CASE WHEN q < ${EPS} THEN q % 3 + 1 ELSE 4 END`)},
      CASE WHEN q < ${EPS} THEN ${spec('s', '48', '36')} END,
      CASE WHEN q < ${EPS} THEN ${spec('s', '38.9', '38.7')} END, CASE WHEN q < ${EPS} THEN ${spec('s', '20.9', '16.5')} END,
      CASE WHEN q < ${EPS} THEN ${spec('s', '31.2', '31.5')} END, CASE WHEN q < ${EPS} THEN ${spec('s', '2050', '1550')} END,
      CASE WHEN q < ${EPS} THEN ${spec('s', '2650', '2100')} END,
      CASE WHEN q < ${EPS} THEN ${spec('s', `'320 A blue'`, `'350 A grey'`)} END,
      CASE WHEN q < ${EPS} THEN ARRAY['flooded_lead_acid']::battery_chemistry[] ELSE '{}' END,
      9000 + q * 7
    FROM tmap`)
  await run(`
    INSERT INTO batteries (id, site_id, serial, home_area_id, chemistry, voltage, cell_count, capacity_ah, weight_lb,
      length_in, width_in, height_in, connector, manufactured_on, in_service_on, out_of_service, out_of_service_reason)
    SELECT id, site_id, 'LB' || ${pad('s', 2)} || '-' || ${pad('p + 1', 4)}, ${areaId('s', 'a')}, 'flooded_lead_acid', volt, volt / 2, cap,
      ${spec('s', '(ARRAY[2190, 2380, 2540])[p % 3 + 1]', '(ARRAY[1650, 1800, 1950])[p % 3 + 1]')},
      ${spec('s', '38.4', '38.2')}, ${spec('s', '20.6', '16.1')}, ${spec('s', '30.7', '31.0')}, ${spec('s', `'320 A blue'`, `'350 A grey'`)},
      (${T0} - interval '1160 days')::date, (${T0} - interval '1100 days')::date,
      p >= ${2 * EPS} AND p % 50 = 9, CASE WHEN p >= ${2 * EPS} AND p % 50 = 9 THEN 'Cracked cell jar; awaiting repair.' END
    FROM bmap`)
  await run(`
    INSERT INTO chargers (id, site_id, name, serial, area_id, charger_type, output_voltage, max_current_a, min_capacity_ah, max_capacity_ah, chemistry_profiles)
    SELECT ${chargerId('s', 'a', 'c')}, ${siteId('s')}, 'CH-' || chr(64 + a) || ${pad('c + 1', 2)}, 'LC' || ${pad('s', 2)} || a || ${pad('c', 2)},
      ${areaId('s', 'a')}, 'iu', ${spec('s', '48', '36')}, 150, 700, 1000, ARRAY['flooded_lead_acid']::battery_chemistry[]
    FROM generate_series(1, ${SITES}) s, generate_series(1, 3) a, generate_series(0, ${CPA - 1}) c`)
  // Cylinders: the first (trucks − electric) at each site sit in the LP trucks; the rest full, empty, a few held.
  const lpTrucks = TPS - EPS
  await run(`
    INSERT INTO lp_cylinders (id, site_id, serial, area_id, specification, water_capacity_lb, tare_lb, nominal_propane_lb,
      manufacture_year, manufacture_month, status, current_truck_id, status_changed_at, out_of_service, out_of_service_reason)
    SELECT ${cylinderId('k')}, ${siteId('s')}, 'LC' || ${pad('s', 2)} || '-' || ${pad('r + 1', 4)}, ${areaId('s', '4')}, 'dot_4bw', 79.5,
      29.5 + (r % 7) * 0.3, 33.5, 2015 + r % 10, r % 12 + 1,
      (CASE WHEN r < ${lpTrucks} THEN 'in_use' WHEN r % 50 = 25 THEN 'quarantined' WHEN r % 50 = 26 THEN 'condemned' WHEN r % 2 = 0 THEN 'full' ELSE 'empty' END)::cylinder_status,
      CASE WHEN r < ${lpTrucks} THEN ${truckId(`((s - 1) * ${TPS} + ${EPS} + r)`)} END,
      ${T0} - interval '1 day', r % 50 = 25, CASE WHEN r % 50 = 25 THEN 'Valve seal weeping; held for the supplier.' END
    FROM (SELECT k, k / ${CPS} + 1 AS s, k % ${CPS} AS r FROM generate_series(0, ${SITES * CPS - 1}) k) x`)

  // One live tag per asset, numbered in creation order, and the counters that continue from there.
  await run(`
    INSERT INTO tags (code, asset_kind, asset_id, site_id, issued_at)
    SELECT 'B-' || ${pad('i + 1', 5)}, 'battery'::asset_kind, id, site_id, ${T0} - interval '1100 days' FROM bmap
    UNION ALL SELECT 'T-' || ${pad('j + 1', 5)}, 'truck'::asset_kind, id, site_id, ${T0} - interval '1100 days' FROM tmap
    UNION ALL SELECT 'C-' || ${pad('row_number() OVER (ORDER BY site_id, area_id, name)', 5)}, 'charger'::asset_kind, id, site_id, ${T0} - interval '1100 days' FROM chargers
    UNION ALL SELECT 'L-' || ${pad('row_number() OVER (ORDER BY site_id, serial)', 5)}, 'cylinder'::asset_kind, id, site_id, ${T0} - interval '1100 days' FROM lp_cylinders
    UNION ALL SELECT 'A-' || ${pad('row_number() OVER (ORDER BY site_id, name)', 5)}, 'area'::asset_kind, id, site_id, ${T0} - interval '1100 days' FROM areas`)
  await run(`
    INSERT INTO tag_counters (prefix, last)
    SELECT left(code, 1), max(substr(code, 3)::int) FROM tags GROUP BY left(code, 1)`)
  log('assets and tags')

  // Battery history, older than three days (the latest every-cell reading within the last month): each truck rotates through its own six batteries
  // (positions q, q+80, … q+400), so no battery was ever in two trucks at once.
  await run(`
    INSERT INTO battery_swaps (site_id, user_id, at, recorded_at, truck_id, battery_out_id, battery_in_id, hour_meter)
    SELECT t.site_id, ${userId('t.s', `'operator'`)}, x.at, x.at, t.id,
      ${batteryId(`((t.s - 1) * ${BPS} + t.q + ${EPS} * ((k + 1) % 6))`)}, ${batteryId(`((t.s - 1) * ${BPS} + t.q + ${EPS} * (k % 6))`)},
      9000 + t.q * 7 - k * 8
    FROM tmap t CROSS JOIN generate_series(1, ${HISTORY.swapsPerTruck}) k
    CROSS JOIN LATERAL (SELECT ${T0} - interval '3 days' - k * interval '262 hours' + ((t.j * 37 + k * 11) % 180) * interval '1 minute' AS at) x
    WHERE t.q < ${EPS}`)
  log('battery swaps (history)')
  await run(`
    INSERT INTO charge_sessions (site_id, user_id, at, recorded_at, battery_id, charger_id, ended_at, ended_by, amp_hours_returned,
      end_temp_f, equalize, outcome, grid_kwh, energy_cost, counted_cycle)
    SELECT b.site_id, b.tech, x.at, x.at, b.id, ${chargerId('b.s', 'b.a', `((b.p + k) % ${CPA})`)}, x.at + interval '7 hours', b.tech,
      b.cap * 0.78, 96 + (b.i + k) % 17, k % 5 = 0,
      (CASE WHEN k % 17 = 0 THEN 'interrupted' ELSE 'complete' END)::charge_outcome,
      round((b.cap * 0.78 * b.volt / 1000.0 / 0.85)::numeric, 2), round((b.cap * 0.78 * b.volt / 1000.0 / 0.85 * 0.12)::numeric, 2),
      k % 17 <> 0
    FROM bmap b CROSS JOIN generate_series(1, ${HISTORY.chargesPerBattery}) k
    CROSS JOIN LATERAL (SELECT ${T0} - interval '3 days' - k * interval '27 days' + ((b.i * 7919 + k * 104729) % 600) * interval '1 minute' AS at) x`)
  log('charge sessions (history)')
  await run(`
    CREATE TEMP TABLE checks AS
    SELECT ${uid(`'check:' || b.i || ':' || k`)} AS id, b.i, b.id AS battery_id, b.site_id, b.tech, b.volt / 2 AS cells, k,
      ${T0} - interval '3 days' - (k - 1) * interval '90 days' - (b.i % 25) * interval '1 day' - ((b.i * 31 + k * 17) % 300) * interval '1 minute' AS at,
      CASE WHEN k IN (1, 7) THEN 'every_cell' WHEN k % 2 = 0 THEN 'pilot_cell' END AS scope
    FROM bmap b CROSS JOIN generate_series(1, ${HISTORY.checksPerBattery}) k`)
  await run(`
    INSERT INTO electrolyte_checks (id, site_id, user_id, at, recorded_at, battery_id, level, water_added_gal, scope, reference_temp_f,
      correction_per_deg_f, mean_corrected_sg, spread, low_cell_count, state_of_charge_pct, after_charge)
    SELECT id, site_id, tech, at, at, battery_id, 'ok', 1.5, scope::reading_scope, 80, 0.0004,
      CASE WHEN scope IS NOT NULL THEN 1.280 + (i % 5) * 0.002 END, CASE WHEN scope = 'every_cell' THEN 0.012 END, 0,
      CASE WHEN scope IS NOT NULL THEN 96 END, true
    FROM checks`)
  await run(`
    INSERT INTO cell_readings (check_id, cell_number, specific_gravity, temperature_f, corrected_sg, low)
    SELECT c.id, n, 1.276 + ((c.i + n) % 7) * 0.002, 90, 1.276 + ((c.i + n) % 7) * 0.002 + 0.004, false
    FROM checks c CROSS JOIN LATERAL generate_series(1, CASE c.scope WHEN 'every_cell' THEN c.cells ELSE 1 END) n
    WHERE c.scope IS NOT NULL`)
  log('electrolyte checks and cell readings (history)')

  // The last three days, which set what the Bay board shows now. Positions 0–79 are in trucks (swapped
  // in 1–20 h ago, out came q+80, which now needs a charge); from 160 on, by position mod 10:
  // 0–5 Ready, 6 on charge, 7 cooling, 8 interrupted charge, 9 watering overdue (every 50th held).
  await run(`
    INSERT INTO battery_swaps (site_id, user_id, at, recorded_at, truck_id, battery_out_id, battery_in_id, hour_meter)
    SELECT b.site_id, ${userId('b.s', `'operator'`)}, x.at, x.at, ${truckId(`((b.s - 1) * ${TPS} + b.p)`)}, ${batteryId(`(b.i + ${EPS})`)}, b.id, 9000 + b.p * 7
    FROM bmap b CROSS JOIN LATERAL (SELECT ${T0} - (b.p % 20 + 1) * interval '1 hour' AS at) x
    WHERE b.p < ${EPS}`)
  await run(`
    INSERT INTO charge_sessions (site_id, user_id, at, recorded_at, battery_id, charger_id, ended_at, ended_by, amp_hours_returned,
      end_temp_f, equalize, outcome, grid_kwh, energy_cost, counted_cycle)
    SELECT b.site_id, b.tech, x.ended - interval '8 hours', x.ended - interval '8 hours', b.id,
      ${chargerId('b.s', 'b.a', `((b.p - b.area_start) % ${CPA})`)}, x.ended, b.tech, b.cap * 0.8, 104, b.p % 10 <> 8,
      (CASE WHEN b.p % 10 = 8 THEN 'interrupted' ELSE 'complete' END)::charge_outcome,
      round((b.cap * 0.8 * b.volt / 1000.0 / 0.85)::numeric, 2), round((b.cap * 0.8 * b.volt / 1000.0 / 0.85 * 0.12)::numeric, 2),
      b.p % 10 <> 8
    FROM bmap b CROSS JOIN LATERAL (SELECT ${T0} - CASE WHEN b.p % 10 = 7 THEN interval '4 hours' ELSE interval '22 hours' END AS ended) x
    WHERE (b.p < ${EPS} OR b.p >= ${2 * EPS}) AND b.p % 10 <> 6 AND NOT (b.p >= ${2 * EPS} AND b.p % 50 = 9)`)
  await run(`
    INSERT INTO charge_sessions (site_id, user_id, at, recorded_at, battery_id, charger_id)
    SELECT b.site_id, b.tech, ${T0} - interval '3 hours', ${T0} - interval '3 hours', b.id, ${chargerId('b.s', 'b.a', `((b.p - b.area_start) / 10)`)}
    FROM bmap b WHERE b.p >= ${2 * EPS} AND b.p % 10 = 6`)
  await run(`
    INSERT INTO electrolyte_checks (site_id, user_id, at, recorded_at, battery_id, level, water_added_gal, after_charge)
    SELECT b.site_id, b.tech, ${T0} - CASE WHEN b.p % 10 = 9 AND b.p >= ${2 * EPS} THEN interval '9 days' ELSE interval '21 hours' END,
      ${T0} - CASE WHEN b.p % 10 = 9 AND b.p >= ${2 * EPS} THEN interval '9 days' ELSE interval '21 hours' END, b.id, 'ok', 1.2, true
    FROM bmap b`)
  log('battery room: the last three days')

  // Fuel: refills, cylinder changes (each LP truck rotates through its own five cylinders), emissions tests.
  const inspection = lit(Object.fromEntries(PREFILL_INSPECTION_ITEMS.map(item => [item.key, 'pass'])))
  await run(`
    INSERT INTO cylinder_refills (site_id, user_id, at, recorded_at, cylinder_id, inspection, gross_before_lb, gross_after_lb, measured_tare_lb,
      product_sg, net_added_lb, fill_limit_lb, gallons_at60_f)
    SELECT ${siteId('x.s')}, ${userId('x.s', `'technician'`)}, y.at, y.at, ${cylinderId('x.k')}, ${inspection}::jsonb,
      x.tare + 2, x.tare + 35.2, x.tare, 0.504, 33.2, 33.4, 7.9
    FROM (SELECT k, k / ${CPS} + 1 AS s, 29.5 + (k % ${CPS} % 7) * 0.3 AS tare FROM generate_series(0, ${SITES * CPS - 1}) k) x
    CROSS JOIN generate_series(1, ${HISTORY.refillsPerCylinder}) n
    CROSS JOIN LATERAL (SELECT ${T0} - interval '2 days' - n * interval '36 days' + ((x.k * 13 + n * 7) % 400) * interval '1 minute' AS at) y`)
  await run(`
    INSERT INTO cylinder_exchanges (site_id, user_id, at, recorded_at, truck_id, cylinder_off_id, cylinder_on_id)
    SELECT t.site_id, ${userId('t.s', `'operator'`)}, x.at, x.at, t.id,
      ${cylinderId(`((t.s - 1) * ${CPS} + (t.q - ${EPS}) + ${lpTrucks} * ((n + 1) % 5))`)},
      ${cylinderId(`((t.s - 1) * ${CPS} + (t.q - ${EPS}) + ${lpTrucks} * (n % 5))`)}
    FROM tmap t CROSS JOIN generate_series(0, ${HISTORY.exchangesPerTruck - 1}) n
    CROSS JOIN LATERAL (SELECT ${T0} - interval '1 day' - n * interval '175 hours' + ((t.j * 17 + n) % 120) * interval '1 minute' AS at) x
    WHERE t.q >= ${EPS}`)
  await run(`
    INSERT INTO emissions_tests (site_id, user_id, at, recorded_at, truck_id, tested_on, tester_name, co_idle_pct, co_high_idle_pct, hc_ppm,
      co2_pct, o2_pct, idle_rpm, high_idle_rpm, passed, next_due_on)
    SELECT t.site_id, ${userId('t.s', `'technician'`)}, x.on_day, x.on_day, t.id, x.on_day::date, 'Site technician', 0.4, 0.6, 120, 13.5, 0.6, 750, 2200, true,
      (x.on_day + interval '182 days')::date
    FROM tmap t CROSS JOIN generate_series(0, ${HISTORY.emissionsPerTruck - 1}) n
    CROSS JOIN LATERAL (SELECT ${T0} - interval '20 days' - n * interval '182 days' + (t.j % 30) * interval '1 day' AS on_day) x
    WHERE t.q >= ${EPS}`)
  log('fuel: refills, cylinder changes, emissions tests')

  // Daily checklists for three years: every area, one log a day, signed by the safety lead except today's.
  await run(`
    INSERT INTO checklist_templates (id, site_id, area_kind, cadence, title, items)
    SELECT ${templateId('s', `'charging_area'`)}, ${siteId('s')}, 'charging_area'::area_kind, 'daily'::checklist_cadence, 'Charging area — daily check', ${lit(CHARGING_AREA_ITEMS)}::jsonb FROM generate_series(1, ${SITES}) s
    UNION ALL
    SELECT ${templateId('s', `'fuel_station'`)}, ${siteId('s')}, 'fuel_station'::area_kind, 'daily'::checklist_cadence, 'Fuel station — daily check', ${lit(FUEL_STATION_ITEMS)}::jsonb FROM generate_series(1, ${SITES}) s`)
  await run(`
    CREATE TEMP TABLE logs AS
    SELECT ${uid(`'log:' || s || ':' || a || ':' || d`)} AS id, s, a, d, (${T0} - d * interval '1 day')::date AS day
    FROM generate_series(1, ${SITES}) s, generate_series(1, 4) a, generate_series(0, ${HISTORY.logDays - 1}) d`)
  await run(`
    INSERT INTO area_logs (id, site_id, area_id, template_id, cadence, period_start, signed_by, signed_at)
    SELECT id, ${siteId('s')}, ${areaId('s', 'a')}, ${templateId('s', `CASE WHEN a = 4 THEN 'fuel_station' ELSE 'charging_area' END`)}, 'daily', day,
      CASE WHEN d > 0 THEN ${userId('s', `'safety_lead'`)} END, CASE WHEN d > 0 THEN day + interval '18 hours' END
    FROM logs`)
  const itemKeys = (items: { key: string }[]) => `ARRAY[${items.slice(0, HISTORY.entriesPerLog).map(i => `'${i.key}'`).join(', ')}]`
  await run(`
    INSERT INTO area_log_entries (site_id, user_id, at, recorded_at, log_id, item_key, result)
    SELECT ${siteId('l.s')}, ${userId('l.s', `'technician'`)}, l.day + interval '6 hours' + n * interval '2 minutes', l.day + interval '6 hours' + n * interval '2 minutes', l.id,
      (CASE WHEN l.a = 4 THEN ${itemKeys(FUEL_STATION_ITEMS)} ELSE ${itemKeys(CHARGING_AREA_ITEMS)} END)[n], 'pass'
    FROM logs l CROSS JOIN generate_series(1, ${HISTORY.entriesPerLog}) n
    WHERE l.day + interval '6 hours' + n * interval '2 minutes' <= ${T0}`)
  log('area logs and entries')

  // Put the indexes and foreign keys back; two connections share the index builds.
  const second = postgres(url, { max: 1, onnotice: () => {} })
  await second.unsafe(`SET maintenance_work_mem = '256MB'`)
  const queue = [...indexes]
  const worker = async (conn: postgres.Sql) => {
    for (let ix = queue.shift(); ix; ix = queue.shift()) await conn.unsafe(ix.def)
  }
  await Promise.all([worker(sql), worker(second)])
  await second.end()
  log(`rebuilt ${indexes.length} indexes`)
  for (const fk of fks) await run(`ALTER TABLE ${fk.tbl} ADD CONSTRAINT "${fk.name}" ${fk.def}`)
  log(`re-added and validated ${fks.length} foreign keys`)

  // Schedules for the due list, when the data model has them (default rules per site).
  try {
    const { defaultSchedules } = await import('../../shared/utils/due-schedules')
    const columns = new Set((await sql<{ c: string }[]>`SELECT column_name AS c FROM information_schema.columns WHERE table_name = 'schedules'`).map(r => r.c))
    const list = defaultSchedules()
    const rows = list.map(d => ({
      kind: d.kind, title: d.title, applies_to: d.appliesTo, rule: d.rule, every: d.every, every_unit: d.everyUnit,
      ...(columns.has('within_days') ? { within_days: d.withinDays } : {}),
      ...(columns.has('after_fail_days') ? { after_fail_days: d.afterFailDays } : {}),
      due_soon_days: d.dueSoonDays, responsible_role: d.responsibleRole, source: d.source, active: d.active,
    }))
    const values = Array.from({ length: SITES }, (_, s) => rows.map(r => ({ ...r, site_id: benchId(`site:${s + 1}`) }))).flat()
    await sql`INSERT INTO schedules ${sql(values)}`
    log(`schedules: ${list.length} per site`)
  }
  catch (error) {
    log(`schedules skipped (${error instanceof Error ? error.message : error})`)
  }

  // Statistics for the planner, then the read models from the records, as `npm run rebuild-state` computes them.
  await run(`ANALYZE`)
  const db = drizzle(sql, { schema, casing: 'snake_case' })
  const rebuilt = await rebuildReadModels(db)
  await run(`UPDATE read_model_rebuilds SET needed = false, done_at = now()`)
  log(`read models: ${rebuilt.batteries} batteries, ${rebuilt.trucks} trucks, ${rebuilt.obligations} obligations`)

  // A steady state, as autovacuum would leave it: statistics and the visibility map.
  await run(`VACUUM (ANALYZE)`)
  log('vacuumed and analyzed')

  const tables = await sql<{ name: string }[]>`SELECT tablename AS name FROM pg_tables WHERE schemaname = 'public'`
  const counts: { table: string, rows: number }[] = []
  for (const t of tables) {
    const [row] = await run(`SELECT count(*)::int AS n FROM "${t.name}"`)
    if (row!.n > 0) counts.push({ table: t.name, rows: row!.n })
  }
  counts.sort((a, b) => b.rows - a.rows)
  const total = counts.reduce((sum, r) => sum + Number(r.rows), 0)
  console.log('\nrows per table')
  for (const r of counts) console.log(`  ${r.table.padEnd(24)} ${Number(r.rows).toLocaleString('en-US').padStart(11)}`)
  console.log(`  ${'total'.padEnd(24)} ${total.toLocaleString('en-US').padStart(11)}`)
  console.log(`\n${database} ready in ${elapsed()} (data "now" ${t0})`)
}
finally {
  await sql.end()
}
