import { afterAll, describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { sql } from 'drizzle-orm'
import { closeTestDb, useTestDb } from '../support/db'
import { obligationStateSql } from '../../server/utils/due/list'
import { obligationStateAt } from '../../shared/utils/due-rules'
import { addCalendarInterval } from '../../shared/utils/due-dates'

// The due list sorts and cuts its page in the database, so it restates the rule module's
// obligationStateAt in SQL. Here both judge the same random obligations on the same days.

const day = fc.integer({ min: -400, max: 400 }).map(n => addCalendarInterval('2028-02-15', n, 'day'))
const obligation = fc.record({
  dueOn: fc.option(day, { nil: null }),
  dueAtCount: fc.option(fc.integer({ min: 0, max: 500 }), { nil: null }),
  countNow: fc.option(fc.integer({ min: 0, max: 500 }), { nil: null }),
  dueSoonDays: fc.integer({ min: 0, max: 90 }),
})

describe('the obligation state in SQL', () => {
  afterAll(closeTestDb)

  it('is the rule module\'s on random obligations and days', async () => {
    await fc.assert(fc.asyncProperty(day, fc.array(obligation, { minLength: 1, maxLength: 200 }), async (today, rows) => {
      const values = sql.join(rows.map((r, i) => sql`(${i}::int, ${r.dueOn}::date, ${r.dueAtCount}::float8, ${r.countNow}::float8, ${r.dueSoonDays}::int)`), sql`, `)
      const got = await useTestDb().execute<{ i: number, state: string }>(sql`
        SELECT o.i, ${obligationStateSql(today)} AS state FROM (VALUES ${values}) AS o(i, due_on, due_at_count, count_now, due_soon_days) ORDER BY o.i`)
      expect(got.map(g => g.state)).toEqual(rows.map(r => obligationStateAt(r, today)))
    }), { numRuns: 60 })
  })
})
