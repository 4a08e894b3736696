import { plusInterval } from './due-rules'
import { RETRAINING_REASON_LABELS, type RetrainingReason } from './truck-inspection'

// Who may drive a truck: an operator trained and evaluated on its class (29 CFR 1910.178(l)(1)), evaluated
// again at least every three years (1910.178(l)(4)(iii)), and again after an event that calls for refresher
// training (1910.178(l)(4)(ii)).

export const EVALUATION_YEARS = 3

export interface ClassQualification {
  trainedOn: string
  evaluatedOn: string | null
  expiresOn: string
}

export interface RetrainingCall {
  happenedOn: string
  reason: RetrainingReason
}

/** The day an evaluation on a class falls due: the record's own expiry or three years after the evaluation, whichever is first. */
export function evaluationDueOn(q: ClassQualification): string {
  if (!q.evaluatedOn) return q.trainedOn
  const byRule = plusInterval(q.evaluatedOn, EVALUATION_YEARS, 'year')
  return byRule < q.expiresOn ? byRule : q.expiresOn
}

/** Why this person may not take a truck of a class: a coded reason (`refusal.truck_class_not_authorised_<variant>`) with its English words. */
export interface AuthorisationReason {
  code: 'truck_class_not_authorised'
  message: string
  params: { variant: 'no_training' | 'no_evaluation' | 'lapsed' | 'retraining', class: number, trained?: string, due?: string, evaluated?: string, called?: string, retraining?: RetrainingReason }
}

/**
 * Why this person may not take a class `truckClass` truck on `today` (null when they may).
 * `q` is their latest qualification on the class, `retraining` the latest event calling for retraining.
 */
export function truckAuthorisationReason(truckClass: number, q: ClassQualification | null, retraining: RetrainingCall | null, today: string): AuthorisationReason | null {
  const reason = (params: AuthorisationReason['params'], message: string): AuthorisationReason => ({ code: 'truck_class_not_authorised', message, params })
  if (!q) return reason({ variant: 'no_training', class: truckClass }, `You are not authorised for class ${truckClass} trucks: no training and evaluation on that class is on record. A safety lead or admin records it.`)
  if (!q.evaluatedOn) return reason({ variant: 'no_evaluation', class: truckClass, trained: q.trainedOn }, `You were trained on class ${truckClass} trucks on ${q.trainedOn} but no evaluation is on record. A safety lead or admin records it.`)
  const due = evaluationDueOn(q)
  if (due < today) return reason({ variant: 'lapsed', class: truckClass, due, evaluated: q.evaluatedOn }, `Your evaluation on class ${truckClass} trucks lapsed on ${due} (evaluated ${q.evaluatedOn}; every three years, 29 CFR 1910.178(l)(4)(iii)).`)
  if (retraining && retraining.happenedOn >= q.evaluatedOn) {
    return reason({ variant: 'retraining', class: truckClass, called: retraining.happenedOn, retraining: retraining.reason },
      `Retraining was called for on ${retraining.happenedOn} (${RETRAINING_REASON_LABELS[retraining.reason].toLowerCase()}); a new evaluation on class ${truckClass} trucks is due first.`)
  }
  return null
}
