import PgBoss from 'pg-boss'
import postgres from 'postgres'
import type { DbOrTx } from './db'

// The job queue of every app server: pg-boss, in its own schema (`pgboss`) of the application database,
// with a small pool of its own. Any server's worker takes the next job; a job whose worker went away is
// failed after its time limit and, if it has a retry left, taken up again by another server. Timed work
// is a pg-boss schedule: each server's clock proposes it, the queue admits one job per minute for the
// whole cluster, and one worker runs it.

export interface QueueWork {
  /** queue name → handler of one job's data */
  workers: Record<string, { run: (data: Record<string, unknown>) => Promise<void>, concurrency?: number, pollSeconds?: number }>
  /** queue options (time limit, retries, where a job given up goes) */
  queues: Record<string, { expireInSeconds: number, retryLimit: number, deadLetter?: string, policy?: 'standard' | 'singleton' }>
  /** queue name → cron (minutes, UTC); a queue listed with null is unscheduled */
  schedules: Record<string, string | null>
}

let boss: PgBoss | undefined
let ready: () => void = () => {}
let started = new Promise<void>((resolve) => {
  ready = resolve
})
const workerIds = new Map<string, string[]>()
let lastErrorLogged = 0

/** Seconds a background job may run before it is taken as lost (BAYWARD_JOB_TIMEOUT_SECONDS, 600). */
export function jobTimeoutSeconds(): number {
  const seconds = Number(process.env.BAYWARD_JOB_TIMEOUT_SECONDS ?? 600)
  return Number.isFinite(seconds) && seconds >= 1 ? Math.round(seconds) : 600
}

function queueOptions(databaseUrl: string): PgBoss.ConstructorOptions {
  const timeout = jobTimeoutSeconds()
  return {
    connectionString: databaseUrl,
    application_name: 'bayward-queue',
    schema: 'pgboss',
    max: Number(process.env.BAYWARD_QUEUE_POOL ?? 3),
    // how often one server (whichever takes the turn) fails jobs that ran past their time limit
    maintenanceIntervalSeconds: Math.max(1, Math.min(60, Math.round(timeout / 5))),
    cronMonitorIntervalSeconds: 15,
    // finished jobs are kept a day in the queue's own tables; our background_jobs rows hold what a person sees
    archiveCompletedAfterSeconds: 3600,
    deleteAfterDays: 1,
  }
}

/**
 * Starts pg-boss with the given queues, workers and schedules. While the database cannot be reached it
 * tries again every few seconds in the background; the server answers meanwhile.
 */
export function startQueue(databaseUrl: string, work: QueueWork): { stop: () => Promise<void> } {
  let stopped = false
  let retry: ReturnType<typeof setTimeout> | undefined
  const attempt = async () => {
    const candidate = new PgBoss(queueOptions(databaseUrl))
    candidate.on('error', logQueueError)
    try {
      await candidate.start()
      await oneServerAtATime(databaseUrl, async () => {
        for (const [name, options] of Object.entries(work.queues)) {
          const queue: PgBoss.Queue = { name, policy: options.policy ?? 'standard', expireInSeconds: options.expireInSeconds, retryLimit: options.retryLimit, retryDelay: 0 }
          if (options.deadLetter) queue.deadLetter = options.deadLetter
          await candidate.createQueue(name, queue)
          // the same queue from an earlier start may have other limits: these win
          await candidate.updateQueue(name, queue)
        }
        for (const [name, cron] of Object.entries(work.schedules)) {
          if (cron) await candidate.schedule(name, cron, {}, { tz: 'UTC' })
          else await candidate.unschedule(name)
        }
      })
      if (stopped) return await candidate.stop({ graceful: false })
      for (const [name, worker] of Object.entries(work.workers)) {
        const ids: string[] = []
        for (let i = 0; i < (worker.concurrency ?? 1); i++) {
          ids.push(await candidate.work<Record<string, unknown>>(name, { batchSize: 1, pollingIntervalSeconds: worker.pollSeconds ?? 2 }, async ([job]) => {
            if (job) await worker.run(job.data ?? {})
          }))
        }
        workerIds.set(name, ids)
      }
      boss = candidate
      ready()
    }
    catch (error) {
      logQueueError(error)
      await candidate.stop({ graceful: false }).catch(() => {})
      if (!stopped) {
        retry = setTimeout(attempt, 3000)
        retry.unref()
      }
    }
  }
  void attempt()
  return {
    stop: async () => {
      stopped = true
      clearTimeout(retry)
      const running = boss
      boss = undefined
      started = new Promise<void>((resolve) => {
        ready = resolve
      })
      workerIds.clear()
      // jobs still running after the grace time are failed, and retried by another server
      await running?.stop({ graceful: true, wait: true, timeout: 10_000 }).catch(logQueueError)
    },
  }
}

// Servers starting together each create the same queues (a table per queue): done at the same moment they
// wait on each other's locks and PostgreSQL may end one as a deadlock, so the queue of that server started
// seconds late (seen with two servers started at once). A session lock on a connection of its own lets one
// server at a time set them up; the others then find them made. Ending the session releases the lock.
const QUEUE_SETUP_LOCK = 725462
async function oneServerAtATime(databaseUrl: string, work: () => Promise<void>) {
  const lock = postgres(databaseUrl, { max: 1, onnotice: () => {}, connection: { application_name: 'bayward-queue-setup' } })
  try {
    await lock`SELECT pg_advisory_lock(${QUEUE_SETUP_LOCK})`
    await work()
  }
  finally {
    await lock.end({ timeout: 5 })
  }
}

// The queue's errors (the database away, a query refused) go to the log, at most one every ten seconds.
function logQueueError(error: unknown) {
  if (Date.now() - lastErrorLogged < 10_000) return
  lastErrorLogged = Date.now()
  console.error('job queue:', error instanceof Error ? error.message : error)
}

// pg-boss writes its job with the statement text and $n parameters it is given; inside a drizzle
// transaction they are run as one statement with the same parameters (the job's data as JSON text).
function inTransaction(tx: DbOrTx): PgBoss.Db {
  const param = (v: unknown) => (v !== null && typeof v === 'object' && !(v instanceof Date) ? JSON.stringify(v) : v ?? null)
  return {
    executeSql: async (text: string, values: unknown[]) => {
      const parts = text.split(/\$(\d+)/)
      const query = sql.join(parts.map((part, i) => (i % 2 ? sql`${param(values[Number(part) - 1])}` : sql.raw(part))))
      return { rows: [...await tx.execute(query)] }
    },
  }
}

// Sending needs no connection of pg-boss's own (the statement runs in the caller's transaction), so one
// instance that is never started serves every send, also while the workers are still starting.
let sender: PgBoss | undefined

/** How long a request that queues a job waits for this server's queue while it is still starting. */
const QUEUE_START_WAIT_MS = 10_000

/**
 * Puts a job on the named queue inside the caller's transaction: it exists exactly when the transaction
 * commits. Just after a server starts, its queues may not be made yet (a job sent then is not stored):
 * such a request waits for them a few seconds, and past that is answered 503, nothing saved.
 */
export async function enqueue(tx: DbOrTx, queue: string, data: Record<string, unknown>): Promise<void> {
  if (!boss) await queueStarted(QUEUE_START_WAIT_MS)
  sender ??= new PgBoss(queueOptions(useRuntimeConfig().databaseUrl as string))
  const id = await sender.send(queue, data, { db: inTransaction(tx) })
  if (!id) throw new Error(`the job queue refused a job for ${queue}`)
}

async function queueStarted(ms: number) {
  let timer: ReturnType<typeof setTimeout> | undefined
  const late = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), ms)
  })
  const made = await Promise.race([started.then(() => true), late])
  clearTimeout(timer)
  if (!made) throw codedError(503, 'queue_starting', 'The server is still starting its job queue. Nothing was saved; try again in a moment.')
}

/** Asks this server's workers of the queue to look now rather than at their next poll. */
export function wakeWorkers(queue: string) {
  for (const id of workerIds.get(queue) ?? []) boss?.notifyWorker(id)
}

/** Whether this server's queue is running (tests and health reports). */
export const queueRunning = () => !!boss
