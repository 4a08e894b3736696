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

/**
 * Why this person may not take a class `truckClass` truck on `today`, in words; null when they may.
 * `q` is their latest qualification on the class, `retraining` the latest event calling for retraining.
 */
export function truckAuthorisationProblem(truckClass: number, q: ClassQualification | null, retraining: RetrainingCall | null, today: string): string | null {
  if (!q) return `You are not authorised for class ${truckClass} trucks: no training and evaluation on that class is on record. A safety lead or admin records it.`
  if (!q.evaluatedOn) return `You were trained on class ${truckClass} trucks on ${q.trainedOn} but no evaluation is on record. A safety lead or admin records it.`
  const due = evaluationDueOn(q)
  if (due < today) return `Your evaluation on class ${truckClass} trucks lapsed on ${due} (evaluated ${q.evaluatedOn}; every three years, 29 CFR 1910.178(l)(4)(iii)).`
  if (retraining && retraining.happenedOn >= q.evaluatedOn) {
    return `Retraining was called for on ${retraining.happenedOn} (${RETRAINING_REASON_LABELS[retraining.reason].toLowerCase()}); a new evaluation on class ${truckClass} trucks is due first.`
  }
  return null
}
