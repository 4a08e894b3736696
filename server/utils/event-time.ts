import { BACKDATE_LIMIT_HOURS } from '#shared/utils/battery-room-schemas'

/**
 * When a floor record happened: now, or the time Save was pressed on a device that sent it late, within
 * the back-dating window. Routes check it after a retry key's replay, so a late copy of a stored record
 * is still answered with that record.
 */
export function eventTime(at: string | undefined, field: string, now = new Date()): Date {
  if (!at) return now
  const when = new Date(at)
  if (when.getTime() > now.getTime() + 5 * 60_000) throw codedError(400, 'time_in_future', 'That time is in the future.', { fields: [field] })
  if (when.getTime() < now.getTime() - BACKDATE_LIMIT_HOURS * 3_600_000) {
    throw codedError(400, 'too_far_back', `More than ${BACKDATE_LIMIT_HOURS} h ago; ask a lead to enter a correction instead.`, { params: { hours: BACKDATE_LIMIT_HOURS }, fields: [field] })
  }
  return when
}
