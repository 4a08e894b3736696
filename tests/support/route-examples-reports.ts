import type { Example } from './route-examples'

// The report routes' examples for the role × route matrix (merged into ROUTE_EXAMPLES).
const report = (kind: string): Example => ({ run: x => () => x.c.get(`/api/reports/${kind}?siteId=${x.w.siteId}&from=2026-01-01&to=2026-03-31`) })

export const REPORT_EXAMPLES: Record<string, Example> = {
  'server/api/reports/energy.get.ts': report('energy'),
  'server/api/reports/battery-health.get.ts': report('battery-health'),
  'server/api/reports/replacement.get.ts': report('replacement'),
  'server/api/reports/shortfall.get.ts': report('shortfall'),
  'server/api/reports/propane.get.ts': report('propane'),
  'server/api/reports/compliance.get.ts': report('compliance'),
  'server/api/reports/summary.get.ts': report('summary'),
  'server/api/sites/[id]/tariff.put.ts': { run: x => () => x.c.put(`/api/sites/${x.w.siteId}/tariff`, { tariffPerKwh: 0.12, peakPerKwh: 0.2, peakPeriods: [{ days: [1, 2, 3, 4, 5], start: '12:00', end: '18:00' }] }) },
}
