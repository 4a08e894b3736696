import { BACKDATE_LIMIT_HOURS } from '#shared/utils/battery-room-schemas'

/**
 * When a floor record happened: now, or the time Save was pressed on a device that sent it late, within
 * the back-dating window. Routes check it after a retry key's replay, so a late copy of a stored record
 * is still answered with that record.
 */
export function eventTime(at: string | undefined, field: string, now = new Date()): Date {
  if (!at) return now
  const when = new Date(at)
  const refuse = (message: string) => createError({ statusCode: 400, message, data: { fields: { [field]: message } } })
  if (when.getTime() > now.getTime() + 5 * 60_000) throw refuse('That time is in the future.')
  if (when.getTime() < now.getTime() - BACKDATE_LIMIT_HOURS * 3_600_000) {
    throw refuse(`More than ${BACKDATE_LIMIT_HOURS} h ago; ask a lead to enter a correction instead.`)
  }
  return when
}
