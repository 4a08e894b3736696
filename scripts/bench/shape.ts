import { createHash } from 'node:crypto'

// The shape of the benchmark data set, shared by the generator and the benchmark.
export const BENCH = {
  sites: 50,
  batteriesPerSite: 500,
  trucksPerSite: 100,
  /** trucks 0–79 of a site are electric, the rest LP-gas */
  electricPerSite: 80,
  cylindersPerSite: 200,
  chargersPerArea: 20,
  /** Charge room A of every site holds exactly this many batteries (positions 0–199). */
  boardAreaBatteries: 200,
  /** the regional lead holds operator, technician and both lead roles at sites 1..leadSites */
  leadSites: 10,
  leadEmail: 'regional.lead@larkfield.example.test',
  floorEmail: 'floor.operator@larkfield.example.test',
  /** operator and technician at every site: the shift-change scenario's floor crew */
  shiftEmail: 'shift.crew@larkfield.example.test',
  password: 'bench-yard-lamp-2291',
} as const

export function benchDatabaseUrl(): string {
  return process.env.BAYWARD_BENCH_DATABASE_URL ?? 'postgres://bayward@127.0.0.1:54329/bayward_bench'
}

/** The id the generator gives a row: md5 of its key with the version-4 and variant digits set. */
export function benchId(key: string): string {
  const md5 = createHash('md5').update(key).digest('hex')
  const h = `${md5.slice(0, 12)}4${md5.slice(13, 16)}8${md5.slice(17)}`
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`
}
