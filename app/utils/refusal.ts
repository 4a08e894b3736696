import type { ReasonParams } from '#shared/utils/battery-fit'
import { readSentIssue, type SentIssue } from '#shared/utils/field-messages'

/**
 * One reason the server gave: its code and numbers when it sent them ({ code, message, params }), and its
 * English words, shown when this language has no words for the code (useReasonWords).
 */
export interface RefusalReason { code: string | null, message: string, params?: ReasonParams }

/** A refusal as the client shows it, whatever shape the route answered with. */
export interface Refusal {
  status: number
  message: string
  reasons: RefusalReason[]
  /** field messages of a 400 (`data.fields`), keyed by dotted path */
  fields: Record<string, string>
  /** each field's issue code and limits (`data.issues`), where the server sent them: refusalFields words them */
  issues: Record<string, SentIssue>
  /** a field's own coded problem where a coded refusal's fields differ (`data.fieldCodes`) */
  fieldCodes: Record<string, { code: string, params?: ReasonParams }>
  overridable: boolean
  offerQuarantine: boolean
  /** everything else the route put in `data` */
  data: Record<string, unknown>
}

interface FetchFailure { statusCode?: number, status?: number, data?: { message?: string, statusMessage?: string, data?: Record<string, unknown> } }

// The one parser of the server's refusals: `data.fields` with `data.issues`, `data.reasons` (strings or
// { code, message }), and `message`. Null when no answer came back at all (no connection, timeout).
export function parseRefusal(error: unknown): Refusal | null {
  const e = error as FetchFailure | null
  const status = e?.statusCode ?? e?.status ?? 0
  if (!status) return null
  const data = (e?.data?.data ?? {}) as Record<string, unknown>
  const reasons = (Array.isArray(data.reasons) ? data.reasons : []).map((r: unknown): RefusalReason => {
    if (typeof r === 'string') return { code: null, message: r }
    const given = r as Partial<RefusalReason> | null
    const params = given?.params && typeof given.params === 'object' ? given.params : undefined
    return { code: typeof given?.code === 'string' ? given.code : null, message: String(given?.message ?? ''), ...(params ? { params } : {}) }
  }).filter(r => r.message)
  const fields = data.fields && typeof data.fields === 'object' ? data.fields as Record<string, string> : {}
  const sent = data.issues && typeof data.issues === 'object' ? data.issues as Record<string, unknown> : {}
  const issues = Object.fromEntries(Object.keys(fields).flatMap((k) => {
    const issue = Object.hasOwn(sent, k) ? readSentIssue(sent[k]) : undefined
    return issue ? [[k, issue]] : []
  }))
  const codes = data.fieldCodes && typeof data.fieldCodes === 'object' ? data.fieldCodes as Record<string, { code?: unknown, params?: unknown }> : {}
  const fieldCodes = Object.fromEntries(Object.keys(fields).flatMap((k) => {
    const c = Object.hasOwn(codes, k) ? codes[k] : undefined
    return c && typeof c.code === 'string' ? [[k, { code: c.code, ...(c.params && typeof c.params === 'object' ? { params: c.params as ReasonParams } : {}) }]] : []
  }))
  const message = e?.data?.message || reasons[0]?.message || e?.data?.statusMessage || `Bayward refused it (${status}).`
  return { status, message, reasons, fields, issues, fieldCodes, overridable: data.overridable === true, offerQuarantine: data.offerQuarantine === true, data }
}
