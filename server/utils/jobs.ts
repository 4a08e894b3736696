import { randomUUID } from 'node:crypto'
import { hostname } from 'node:os'
import type { DbOrTx, Transaction } from './db'

// Long work (hundreds of labels, a big CSV) runs as a job: the request writes the job's row and puts it on
// the queue in one transaction and answers its id at once; any app server's worker runs it, writing its
// progress and result to the row, which the client polls at /api/jobs/<id>. Every kind of job is listed in
// server/plugins/queue.ts so every server can run it.

export interface JobState<R = unknown> {
  id: string
  kind: string
  siteId: string
  userId: string
  status: 'running' | 'done' | 'failed'
  done: number
  total: number
  message: string | null
  result: R | null
  createdAt: string
}

export interface JobOwner { siteId: string, userId: string }

/** What a job's work is handed besides its input. */
export interface JobRun {
  jobId: string
  owner: JobOwner
  /** how many of the job's total are done; call it as often as you like (the row is written every 5 %) */
  progress: (done: number) => Promise<void>
  /** ends the job inside `tx`, for work whose writes must count only together with the job's end */
  finishIn: (tx: Transaction, result: unknown) => Promise<void>
}

export interface JobKind<I = unknown, R = unknown> {
  kind: string
  work: (input: I, run: JobRun) => Promise<R>
  /** writes the job and queues it (inside `tx` when given, else in a transaction of its own) */
  start: (owner: JobOwner, total: number, input: I, tx?: DbOrTx) => Promise<{ id: string, total: number }>
}

export const JOB_QUEUE = 'background-job'
export const LOST_JOB_QUEUE = 'background-job-lost'

const kinds = new Map<string, JobKind>()

export function defineJob<I, R>(kind: string, work: (input: I, run: JobRun) => Promise<R>): JobKind<I, R> {
  const start = async (owner: JobOwner, total: number, input: I, tx?: DbOrTx) => {
    const id = randomUUID()
    const write = async (t: DbOrTx) => {
      await t.insert(tables.backgroundJobs).values({ id, kind, siteId: owner.siteId, userId: owner.userId, total, input: input as never })
      await enqueue(t, JOB_QUEUE, { jobId: id })
    }
    if (tx) await write(tx)
    else await useDb().transaction(write)
    return { id, total }
  }
  return { kind, work, start }
}

/** The kinds this server's workers run (server/plugins/queue.ts lists them all). */
export function registerJobKinds(list: JobKind<never, unknown>[]) {
  for (const k of list) kinds.set(k.kind, k as unknown as JobKind)
}

class JobSuperseded extends Error {}

const THIS_SERVER = `${hostname()}:${process.pid}`

const jobs = () => tables.backgroundJobs

// One run of a queued job. The row is claimed by moving its attempt on; every later write names that
// attempt, so a run given up after the time limit (and started again elsewhere) changes nothing.
export async function runQueuedJob(data: Record<string, unknown>) {
  const jobId = String(data.jobId ?? '')
  const db = useDb()
  const t = jobs()
  const [row] = await db.update(t).set({ attempt: sql`${t.attempt} + 1`, startedAt: new Date(), ranOn: THIS_SERVER })
    .where(and(eq(t.id, jobId), eq(t.status, 'running'))).returning()
  if (!row) return
  const mine = and(eq(t.id, jobId), eq(t.attempt, row.attempt), eq(t.status, 'running'))
  const ended = (result: unknown) => ({ status: 'done' as const, done: row.total, result: (result ?? null) as never, input: null, finishedAt: new Date() })
  let finished = false
  let last = 0
  const step = Math.max(1, Math.floor(row.total / 20))
  const run: JobRun = {
    jobId,
    owner: { siteId: row.siteId, userId: row.userId },
    progress: async (done) => {
      if (done - last >= step || done === row.total) {
        last = done
        await db.update(t).set({ done }).where(mine)
      }
      await new Promise(resolve => setImmediate(resolve))
    },
    finishIn: async (tx, result) => {
      const rows = await tx.update(t).set(ended(result)).where(mine).returning({ id: t.id })
      if (!rows.length) throw new JobSuperseded()
      finished = true
    },
  }
  try {
    const kind = kinds.get(row.kind)
    if (!kind) throw new Error(`no worker for jobs of kind "${row.kind}"`)
    const result = await kind.work(row.input, run)
    if (!finished) await db.update(t).set(ended(result)).where(mine)
  }
  catch (error) {
    if (error instanceof JobSuperseded) return
    // the whole error (a database message, a stack) goes to the server log only
    console.error(`job ${jobId} (${row.kind}) failed:`, error)
    await db.update(t).set({ status: 'failed', message: jobFailureMessage(row.kind, jobId, error), input: null, finishedAt: new Date() }).where(mine)
  }
}

// A job the queue gave up on (its worker stopped, the retry too): its owner reads the plain sentence.
export async function failLostJob(data: Record<string, unknown>) {
  const jobId = String(data.jobId ?? '')
  const t = jobs()
  const [row] = await useDb().select({ kind: t.kind }).from(t).where(and(eq(t.id, jobId), eq(t.status, 'running')))
  if (!row) return
  console.error(`job ${jobId} (${row.kind}) was given up: its worker stopped before it finished`)
  await useDb().update(t).set({ status: 'failed', message: jobFailureMessage(row.kind, jobId, null), input: null, finishedAt: new Date() })
    .where(and(eq(t.id, jobId), eq(t.status, 'running')))
}

const JOB_FAILED: Record<string, string> = {
  'import': 'The import stopped and nothing was imported. Check the file again (someone may have added the same records meanwhile) and run it again.',
  'labels': 'The label sheet could not be made. Try again.',
  'audit-pack': 'The audit pack could not be made. Try again.',
}

// What the job's owner reads when it fails: a refusal meant for them (a 4xx) as it was written, anything
// else as a plain sentence with the job's reference for whoever reads the server log.
export function jobFailureMessage(kind: string, jobId: string, error: unknown): string {
  const status = Number((error as { statusCode?: unknown })?.statusCode)
  const message = (error as { message?: unknown })?.message
  if (status >= 400 && status < 500 && typeof message === 'string' && message) return message
  return `${JOB_FAILED[kind] ?? 'The job failed. Try again.'} If it keeps failing, an admin can look up job ${jobId.slice(0, 8)} in the server log.`
}

export async function readJob<R = unknown>(id: string, userId: string): Promise<JobState<R>> {
  const t = jobs()
  const [row] = /^[0-9a-f-]{36}$/.test(id)
    ? await useDb().select({
        id: t.id, kind: t.kind, siteId: t.siteId, userId: t.userId, status: t.status, done: t.done, total: t.total,
        message: t.message, result: t.result, createdAt: t.createdAt,
      }).from(t).where(and(eq(t.id, id), eq(t.userId, userId)))
    : []
  if (!row) throw codedError(404, 'no_such_job', 'No such job.')
  return { ...row, result: row.result as R | null, createdAt: row.createdAt.toISOString() }
}

// A job's result file (a label sheet's PDF) lives in the storage layer beside the uploads, under jobs:<id>.
export const saveJobFile = (id: string, data: Uint8Array) => useStorage('uploads').setItemRaw(`jobs:${id}`, data)
export const readJobFile = (id: string) => readStoredFile(`jobs:${id}`)

/** Finished jobs older than a week go, with their files (a daily scheduled job). */
export async function dropOldJobs(days = 7) {
  const t = jobs()
  const gone = await useDb().delete(t).where(and(inArray(t.status, ['done', 'failed']), lt(t.finishedAt, sql`now() - make_interval(days => ${days}::int)`)))
    .returning({ id: t.id })
  for (const { id } of gone) {
    // an audit pack keeps its ZIP beside its PDF
    for (const key of [`jobs:${id}`, `jobs:${id}-zip`]) await useStorage('uploads').removeItem(key).catch(() => {})
  }
  return { dropped: gone.length }
}
