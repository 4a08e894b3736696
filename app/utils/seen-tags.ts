import { del, entries, get, set } from 'idb-keyval'

/** How many looked-up codes the device keeps for when there is no signal (oldest go first). */
export const SEEN_LIMIT = 300

/** A look-up answered from the device's own copy carries the time the server gave it. */
export type Seen<T> = T & { seenAt?: string }

interface SeenEntry { at: string, data: unknown }

function seenKey(scope: string, code: string): string {
  const session = useSessionStore()
  const clean = normalizeTagCode(code) ?? code.trim().toUpperCase()
  return `seen:${scope}:${session.me?.user.id ?? ''}:${session.siteId ?? ''}:${clean}`
}

/** Keeps a look-up's answer on the device under the code typed and the code it resolved to. */
export async function rememberSeen(scope: string, codes: (string | null | undefined)[], data: object): Promise<void> {
  if (!import.meta.client) return
  const plain: Seen<object> = { ...data }
  delete plain.seenAt
  const entry: SeenEntry = { at: new Date().toISOString(), data: JSON.parse(JSON.stringify(plain)) }
  try {
    for (const code of new Set(codes.filter((c): c is string => !!c?.trim()))) await set(seenKey(scope, code), entry, deviceDb())
    await pruneSeen()
  }
  catch { /* a device without IndexedDB (private mode) just has no offline copy */ }
}

async function pruneSeen() {
  const all = (await entries<string, SeenEntry>(deviceDb())).filter(([k]) => k.startsWith('seen:'))
  if (all.length <= SEEN_LIMIT) return
  all.sort((a, b) => a[1].at.localeCompare(b[1].at))
  for (const [k] of all.slice(0, all.length - SEEN_LIMIT)) await del(k, deviceDb())
}

/** The device's copy of a look-up, marked with the time it was seen; null when it never saw this code. */
export async function recallSeen<T>(scope: string, code: string): Promise<Seen<T> | null> {
  if (!import.meta.client) return null
  try {
    const entry = await get<SeenEntry>(seenKey(scope, code), deviceDb())
    return entry ? { ...(entry.data as T), seenAt: entry.at } : null
  }
  catch {
    return null
  }
}

/**
 * Asks the server; with no answer at all (no signal), falls back to the device's copy of the same code.
 * A refusal (404, 403) is not hidden behind an old copy.
 */
export async function lookupOrSeen<T extends object>(scope: string, code: string, fetcher: () => Promise<T>, codeOf?: (found: T) => string | null): Promise<Seen<T>> {
  try {
    const found = await fetcher()
    void rememberSeen(scope, [code, codeOf?.(found)], found)
    return found
  }
  catch (error) {
    if (parseRefusal(error)) throw error
    const seen = await recallSeen<T>(scope, code)
    if (seen) return seen
    throw error
  }
}

/** "Tue 14:05"-style time a device copy dates from, or null for an answer fresh from the server. */
export function seenAsOf(value: unknown, languageTag = 'en-US'): string | null {
  const at = (value as Seen<object> | null)?.seenAt
  return at ? new Date(at).toLocaleString(languageTag, { weekday: 'short', month: 'short', day: 'numeric', hour: 'numeric', minute: '2-digit' }) : null
}
