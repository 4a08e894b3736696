import type { z } from 'zod'
import type { chargeEndSchema, chargeStartSchema, electrolyteCheckSchema, swapBodySchema } from '#shared/utils/battery-room-schemas'
import type { ChargeOffAnswer, ChargeOnAnswer, CheckAnswer, FloorLookup, SwapAnswer } from '#shared/types/floor'
import type { FloorOutcome, FloorRecordWords } from '~/composables/useFloorForm'

export type { BayCardData, FloorLookup } from '#shared/types/floor'
type Keyed<S extends z.ZodType> = z.input<S> & { idempotencyKey: string }

// Swaps, charges and electrolyte checks from the floor forms: through the device outbox, toast, refresh the board.
export function useBatteryRoomActions() {
  const toast = useToast()
  const i18n = useNuxtApp().$i18n
  const session = useSessionStore()
  const { submitFloorRecord } = useFloorSubmit()
  const BOARD_KEYS = ['bay-board']

  /** A scanned or typed code; with no signal, the device's copy from the last time it was looked up. */
  function lookup(code: string) {
    return lookupOrSeen('floor', code, () => $fetch<FloorLookup>('/api/battery-room/lookup', { query: { siteId: session.siteId, code } }), f => f.code)
  }

  async function settle<T>(outcome: FloorOutcome<T>, saved: (data: T) => void) {
    // a kept record is shown by the form itself and by the outbox banner
    if (outcome.state === 'kept') return outcome
    await Promise.all([refreshNuxtData(BOARD_KEYS), refreshDue()])
    saved(outcome.data)
    return outcome
  }

  async function swap(body: Keyed<typeof swapBodySchema>, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<SwapAnswer>({ kind: 'swap', url: '/api/battery-room/swaps', body, ...words })
    return settle(outcome, r => toast.show(i18n.t(r.overridden?.length ? 'toast.battery_changed_override' : 'toast.battery_changed')))
  }

  async function chargeOn(body: Keyed<typeof chargeStartSchema>, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<ChargeOnAnswer>({ kind: 'charge_on', url: '/api/battery-room/charges', body, ...words })
    return settle(outcome, () => toast.show(i18n.t('toast.on_charge')))
  }

  async function chargeOff(sessionId: string, body: Keyed<typeof chargeEndSchema>, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<ChargeOffAnswer>({ kind: 'charge_off', url: `/api/battery-room/charges/${sessionId}/end`, body, atField: 'endedAt', ...words })
    return settle(outcome, r => toast.show(i18n.t(r.item.ranHot ? 'toast.off_charge_hot' : 'toast.off_charge'), r.item.ranHot ? 'danger' : 'safe'))
  }

  async function check(body: Keyed<typeof electrolyteCheckSchema>, words: FloorRecordWords) {
    const outcome = await submitFloorRecord<CheckAnswer>({ kind: 'check', url: '/api/battery-room/checks', body, ...words })
    return settle(outcome, r => toast.show(r.lowCells?.length ? i18n.t('toast.check_weak_cells', { cells: r.lowCells.join(', ') }) : i18n.t('toast.check_saved'), r.lowCells?.length ? 'danger' : 'safe'))
  }

  return { lookup, swap, chargeOn, chargeOff, check }
}

/** One cell of the hydrometer grid as typed. */
export interface CheckCellEntry { sg: string, temp: string, error: string }
