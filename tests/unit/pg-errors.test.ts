import { describe, expect, it } from 'vitest'
import { unstorableValueError } from '../../server/utils/pg-errors'

// A value PostgreSQL refuses (SQLSTATE class 22, data exception; codes from the PostgreSQL manual, Appendix A
// "PostgreSQL Error Codes": 22008 datetime_field_overflow, 22003 numeric_value_out_of_range, 23505
// unique_violation) is a 400 a screen can word in the reader's language: a code beside the English.
const pgError = (code: string) => ({ message: 'query failed', cause: { code } })

describe('unstorableValueError', () => {
  it('an impossible date is a date field\'s format issue, at that field', () => {
    const error = unstorableValueError(pgError('22008'), { inServiceOn: '2025-04-31', notes: 'x' })
    expect(error?.statusCode).toBe(400)
    expect(error?.data).toEqual({
      code: 'check_fields',
      fields: { inServiceOn: 'Not a real date.' },
      issues: { inServiceOn: { code: 'invalid_format', format: 'date' } },
    })
  })

  it('any other value it cannot store is the coded value_unstorable', () => {
    const error = unstorableValueError(pgError('22003'), { cellCount: 1e12 })
    expect(error?.statusCode).toBe(400)
    expect(error?.data).toEqual({ code: 'value_unstorable' })
  })

  it('other database errors are not bad input', () => {
    expect(unstorableValueError(pgError('23505'), {})).toBeUndefined()
  })
})
