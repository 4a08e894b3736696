import type { OutboxRecordInput } from '~/stores/outbox'

export type FloorOutcome<T> = { state: 'saved', data: T, key: string } | { state: 'kept', key: string }

// What the floor forms call instead of $fetch: the record is kept on the device first, sent now or when
// the connection is back, and stored once by the server under its idempotency key.
export function useFloorSubmit() {
  const outbox = useOutboxStore()

  /** 'saved' with the server's answer, or 'kept' on the device; a refusal of a record sent now throws like $fetch. */
  function submitFloorRecord<T>(input: OutboxRecordInput): Promise<FloorOutcome<T>> {
    return outbox.submit<T>(input)
  }

  return { submitFloorRecord }
}
