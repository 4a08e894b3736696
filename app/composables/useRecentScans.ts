export interface RecentScan { code: string, title: string, kind: string, at?: number }

// The last few tags this device opened, newest first (kept on the device only).
export function useRecentScans() {
  const list = useLocalStorage<RecentScan[]>('bayward-recent-scans', [])
  function remember(scan: RecentScan) {
    list.value = [{ ...scan, at: Date.now() }, ...list.value.filter(s => s.code !== scan.code)].slice(0, 6)
  }
  return { list, remember }
}
