import type { FitReason } from './battery-fit'

// Why a cylinder may not be filled or fitted, as coded reasons: English words (the fallback, stored on a
// refused refill and sent in alerts) and the numbers in stored units. A parameter whose name ends in a
// unit code (`_lb`, `_gal`, `_in`, `_f`) carries a value in that stored unit; the screen shows it in the
// site's units (`refusal.<code>` in i18n/locales).

const lb = (v: number) => `${Math.round(v * 10) / 10} lb`
const reason = (code: string, message: string, params?: FitReason['params']): FitReason => (params ? { code, message, params } : { code, message })

export interface CylinderStateFacts {
  status: string
  outOfService: boolean
  outOfServiceReason: string | null
}

/** Why the cylinder's own state forbids a fill; `truck` names the truck it is on. */
export function fillStateReasons(cylinder: CylinderStateFacts, requal: { status: string, dueOn: string }, truck: string | null): FitReason[] {
  const why = cylinder.outOfServiceReason ?? ''
  const reasons: FitReason[] = []
  if (cylinder.status === 'condemned') reasons.push(reason('fill_condemned', 'This cylinder is condemned and may never be filled again.'))
  if (cylinder.status === 'quarantined') reasons.push(reason(why ? 'fill_quarantined_why' : 'fill_quarantined', `This cylinder is quarantined${why ? `: ${why}` : ''}.`, { why }))
  else if (cylinder.outOfService) reasons.push(reason(why ? 'fill_out_of_service_why' : 'fill_out_of_service', `This cylinder is out of service${why ? `: ${why}` : ''}.`, { why }))
  if (cylinder.status === 'in_use') {
    reasons.push(reason('fill_on_truck', `This cylinder is on ${truck ? `truck ${truck}` : 'a truck'}. Take it off the truck (a cylinder exchange) before refilling.`, { truck: truck ?? '—' }))
  }
  if (requal.status === 'overdue') {
    reasons.push(reason('fill_requal_overdue', `Requalification was due on ${requal.dueOn}. A cylinder past its requalification date cannot be filled until it is requalified.`, { due: requal.dueOn }))
  }
  return reasons
}

/** Why a cylinder may not go on a truck; `code` is its tag code or serial. */
export function mountReasons(cylinder: CylinderStateFacts, requal: { status: string, dueOn: string }, code: string): FitReason[] {
  const name = `Cylinder ${code}`
  const why = cylinder.outOfServiceReason ?? ''
  const reasons: FitReason[] = []
  if (cylinder.status === 'condemned') reasons.push(reason('mount_condemned', `${name} is condemned.`, { cylinder: code }))
  else if (cylinder.status === 'quarantined') reasons.push(reason(why ? 'mount_quarantined_why' : 'mount_quarantined', `${name} is quarantined${why ? `: ${why}` : ''}.`, { cylinder: code, why }))
  else if (cylinder.outOfService) reasons.push(reason(why ? 'mount_out_of_service_why' : 'mount_out_of_service', `${name} is out of service${why ? `: ${why}` : ''}.`, { cylinder: code, why }))
  if (cylinder.status === 'in_use') reasons.push(reason('mount_in_use', `${name} is already on a truck.`, { cylinder: code }))
  if (cylinder.status === 'empty') reasons.push(reason('mount_empty', `${name} is empty. Take a full cylinder from the cage.`, { cylinder: code }))
  if (requal.status === 'overdue') reasons.push(reason('mount_requal_overdue', `${name} was due for requalification on ${requal.dueOn} and may not be used.`, { cylinder: code, due: requal.dueOn }))
  return reasons
}

/** A failed pre-fill inspection; `items` are the failed item keys, `labels` their English words. */
export function prefillFailedReason(items: string[], labels: string[]): FitReason {
  return reason('fill_inspection_failed', `Failed pre-fill inspection: ${labels.join('; ')}. Do not fill this cylinder.`, { items })
}

export function overfillReason(overfillLb: number, limitLb: number, waterCapacityLb: number, percent: number | null): FitReason {
  return reason('fill_overfilled', `Overfilled by ${lb(overfillLb)}: the limit is ${lb(limitLb)} (water capacity ${lb(waterCapacityLb)} × ${percent} %). Remove the excess before the cylinder leaves the station, then weigh it again.`, {
    over_lb: overfillLb, limit_lb: limitLb, capacity_lb: waterCapacityLb, percent: percent ?? 0,
  })
}

export function tareLossReason(measuredLb: number, stampedLb: number, thresholdPercent: number): FitReason {
  const loss = (stampedLb - measuredLb) / stampedLb * 100
  return reason('fill_tare_loss', `Measured tare ${lb(measuredLb)} is ${loss.toFixed(1)} % below the stamped ${lb(stampedLb)} (${thresholdPercent} % or more): send the cylinder for requalification before filling.`, {
    measured_lb: measuredLb, stamped_lb: stampedLb, loss: Math.round(loss * 10) / 10, percent: thresholdPercent,
  })
}

/** Why the person may not refill at all (no current LP-gas transfer qualification). */
export function lpTransferReason(standing: { current: boolean, expiresOn: string | null }): FitReason | null {
  if (standing.current) return null
  return standing.expiresOn
    ? reason('lp_transfer_expired', `Your LP-gas transfer qualification expired on ${standing.expiresOn}. Only people with a current one may refill cylinders; ask your safety lead to record your retraining.`, { expires: standing.expiresOn })
    : reason('lp_transfer_missing', 'Only people trained for LP-gas transfer may refill cylinders, and there is no LP-gas transfer qualification on your record. Ask your safety lead.')
}
