import { describe, expect, it } from 'vitest'
import { bundleByTask, type NowRow } from '../../app/utils/due-views'
import type { DueItem } from '../../app/stores/due'

// A home's "now" list: each task's first three obligations, then one row for the rest that opens them in the due list.
let n = 0
const item = (kind: DueItem['kind'], scheduleId: string | null = null): DueItem => ({
  id: `o${++n}`, kind, scheduleId, what: kind, subject: { kind: 'battery', id: `b${n}`, label: `B${n}`, tagCode: null, areaId: null, periodStart: null },
  areaName: null, personId: null, dueOn: '2026-11-30', state: 'overdue', lastDoneOn: null, remaining: null, detail: null, detailWords: null,
  responsibleRole: 'technician', action: { label: 'Do it', to: '/x' },
})
const shape = (rows: NowRow[]) => rows.map(r => ('item' in r ? r.item.kind : `+${r.more} ${r.key} ${r.to}`))

describe('bundleByTask', () => {
  it('keeps three of a task, then says how many more and links to that task in the due list', () => {
    const pm = '7b0c6a3e-5a0b-4c41-9a57-1d1f0f4b2c11'
    const rows = bundleByTask([item('emissions_test'), ...Array.from({ length: 10 }, () => item('custom', pm)), item('battery_watering')])
    expect(shape(rows)).toEqual([
      'emissions_test', 'custom', 'custom', 'custom',
      `+7 custom:${pm} /due?kind=custom&schedule=${pm}&state=overdue%2Cdue_soon`,
      'battery_watering',
    ])
  })

  it('a task with one more than three shows all four; a built-in kind links by its kind alone', () => {
    expect(shape(bundleByTask(Array.from({ length: 4 }, () => item('battery_watering'))))).toEqual(Array(4).fill('battery_watering'))
    const rows = bundleByTask(Array.from({ length: 6 }, () => item('battery_watering')))
    expect(shape(rows).at(-1)).toBe('+3 battery_watering /due?kind=battery_watering&state=overdue%2Cdue_soon')
  })

  it('two schedules a lead added are two tasks, interleaved items keep their order', () => {
    const rows = bundleByTask([item('custom', 'a'), item('custom', 'b'), item('custom', 'a')])
    expect(rows.map(r => ('item' in r ? r.item.scheduleId : null))).toEqual(['a', 'b', 'a'])
  })
})
