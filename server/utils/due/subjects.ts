import { sql } from 'drizzle-orm'
import { rowsOf, type SqlRunner } from './effective'
import type { SubjectRef } from './rules'

// Which subjects' read models a registry change touches: the asset itself; for a truck also the site's
// areas (indoor CO monitoring applies while a combustion truck runs there); for an area also its chargers
// and its open logs (their rows carry the area).
export async function registrySubjects(db: SqlRunner, kind: 'truck' | 'battery' | 'charger' | 'cylinder' | 'area', row: { id: string, siteId: string }): Promise<SubjectRef[]> {
  const own: SubjectRef = { kind, id: row.id }
  if (kind === 'truck') {
    const areas = await rowsOf<{ id: string }>(db, sql`SELECT id FROM areas WHERE site_id = ${row.siteId}`)
    return [own, ...areas.map(a => ({ kind: 'area' as const, id: a.id }))]
  }
  if (kind === 'area') {
    const [chargers, logs] = await Promise.all([
      rowsOf<{ id: string }>(db, sql`SELECT id FROM chargers WHERE area_id = ${row.id}`),
      rowsOf<{ id: string }>(db, sql`SELECT id FROM area_logs WHERE area_id = ${row.id} AND signed_at IS NULL`),
    ])
    return [own, ...chargers.map(c => ({ kind: 'charger' as const, id: c.id })), ...logs.map(l => ({ kind: 'log' as const, id: l.id }))]
  }
  return [own]
}
