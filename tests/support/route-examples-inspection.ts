import { randomUUID } from 'node:crypto'
import { DEFAULT_INSPECTION_ITEMS } from '../../shared/utils/truck-inspection'
import { truck } from './db'
import { answers } from './inspection'
import type { Example } from './route-examples'

// The pre-shift inspection routes' examples for the role × route matrix (merged into ROUTE_EXAMPLES).

export const INSPECTION_EXAMPLES: Record<string, Example> = {
  'server/api/trucks/[id]/inspection.get.ts': { run: x => () => x.c.get(`/api/trucks/${x.w.truckId}/inspection`) },
  'server/api/trucks/[id]/inspections.post.ts': {
    run: async (x) => {
      const t = await truck({ siteId: x.w.siteId })
      return () => x.c.post(`/api/trucks/${t.id}/inspections`, { idempotencyKey: randomUUID(), hourMeter: 10, templateVersion: 1, answers: answers('electric') })
    },
  },
  'server/api/trucks/[id]/return-to-service.post.ts': {
    run: async (x) => {
      // a truck a technician failed on a critical item, so it stands on hold
      const t = await truck({ siteId: x.w.siteId })
      const failed = await x.w.tech.post(`/api/trucks/${t.id}/inspections`, { idempotencyKey: randomUUID(), hourMeter: 10, templateVersion: 1, answers: answers('electric', { horn: 'Silent' }) })
      if (failed.status !== 201) throw new Error(`inspection fixture answered ${failed.status}`)
      return () => x.c.post(`/api/trucks/${t.id}/return-to-service`, { whatWasDone: 'Replaced the horn fuse' })
    },
  },
  'server/api/inspection/shift.get.ts': { run: x => () => x.c.get(`/api/inspection/shift?siteId=${x.w.siteId}`) },
  'server/api/inspection-templates/index.get.ts': { run: x => () => x.c.get(`/api/inspection-templates?siteId=${x.w.siteId}`) },
  'server/api/inspection-templates/[power].put.ts': {
    run: x => () => x.c.put('/api/inspection-templates/lp_gas', { siteId: x.w.siteId, title: 'LP-gas truck — pre-shift check', items: DEFAULT_INSPECTION_ITEMS.lp_gas }),
  },
  'server/api/users/[id]/retraining.post.ts': {
    run: x => () => x.c.post(`/api/users/${x.w.targetId}/retraining`, { reason: 'near_miss', truckClass: 1, happenedOn: '2026-01-12' }),
  },
}
