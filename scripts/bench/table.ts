import type { RouteFigures } from './load'

// The benchmark's tables, as markdown with aligned columns.

export const TARGETS = {
  tagP95: 20, tagRatio: 0.4, boardP95: 25, dueP95: 50, listP95: 50, memoryMb: 250, scanJsKb: 150, shiftP95: 100,
  /** the swap's p95 before the read models (80–87 ms at 16 connections on this machine) */
  swapP95: 87,
  /** a report of a year: one site's, and all of a lead's sites' */
  reportSiteP95: 150, reportAllP95: 1000,
}

export const ms = (v: number, limitMs: number) => (Number.isFinite(v) ? v.toFixed(1) : `> ${limitMs}`)
export const pass = (ok: boolean) => (ok ? 'PASS' : 'MISS')

export function markdownTable(head: string[], rows: string[][], numeric: (i: number) => boolean): string {
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map(r => (r[i] ?? '').length)))
  const line = (cells: string[]) => `| ${cells.map((c, i) => (numeric(i) ? c.padStart(widths[i]!) : c.padEnd(widths[i]!))).join(' | ')} |`
  return [line(head), `|${widths.map((w, i) => (numeric(i) ? `${'-'.repeat(w + 1)}:` : '-'.repeat(w + 2))).join('|')}|`, ...rows.map(line)].join('\n')
}

/** A route's target and verdict in a pass of the closed-loop runs. */
export function routeVerdict(key: string, f: RouteFigures): [string, string] {
  const ok = f.errors === 0
  switch (key) {
    case 'tag': return [`p95 < ${TARGETS.tagP95} ms @32`, pass(ok && f.p95 < TARGETS.tagP95)]
    case 'board': return [`p95 < ${TARGETS.boardP95} ms @16`, pass(ok && f.p95 < TARGETS.boardP95)]
    case 'due': case 'due-page': case 'due-group': return [`p95 < ${TARGETS.dueP95} ms @16`, pass(ok && f.p95 < TARGETS.dueP95)]
    case 'list': return [`p95 < ${TARGETS.listP95} ms`, pass(ok && f.p95 < TARGETS.listP95)]
    case 'swap': return [`p95 ≤ ${TARGETS.swapP95} ms @16 (before), 0 errors`, pass(ok && f.p95 <= TARGETS.swapP95)]
    case 'report-site': return [`p95 < ${TARGETS.reportSiteP95} ms`, pass(ok && f.p95 < TARGETS.reportSiteP95)]
    case 'report-all': return [`p95 < ${TARGETS.reportAllP95} ms`, pass(ok && f.p95 < TARGETS.reportAllP95)]
    case 'health': return ['baseline', '—']
    default: return ['(reported)', ok ? '—' : 'errors']
  }
}
