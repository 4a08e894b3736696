// After a tag page opens with a signal, the floor forms' own look-up of the same code is fetched once in
// the background, so that a swap, charge, check, refill or cylinder change on this asset can be recorded
// on this device later with no signal (from the copy, marked "as of").
export function useSeenTags() {
  const { lookup } = useBatteryRoomActions()
  const { lookupCylinder } = useFuelActions()

  function warmFloorLookups(kind: string, code: string) {
    if (!import.meta.client || !navigator.onLine) return
    const fetcher = kind === 'cylinder' ? lookupCylinder : ['battery', 'truck', 'charger'].includes(kind) ? lookup : null
    if (fetcher) setTimeout(() => fetcher(code).catch(() => undefined), 250)
  }

  return { warmFloorLookups }
}
