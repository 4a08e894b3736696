import { createStore, type UseStore } from 'idb-keyval'

// What this device keeps in IndexedDB (through idb-keyval): the outbox of floor records, and the device's
// own copies of what it saw last (the signed-in person, tags looked up) for when there is no signal.
let outbox: UseStore | undefined
let device: UseStore | undefined

/** bayward-outbox/records: one floor record per idempotency key. */
export const outboxDb = (): UseStore => (outbox ??= createStore('bayward-outbox', 'records'))
/** bayward-device/kv: 'me' and 'seen:<scope>:<user>:<site>:<code>' entries. */
export const deviceDb = (): UseStore => (device ??= createStore('bayward-device', 'kv'))
