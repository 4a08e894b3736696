import { randomUUID } from 'node:crypto'

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

const storage = () => useStorage('jobs')
// Jobs this server runs, for fast and consistent reads here; storage serves the other app servers.
const live = new Map<string, JobState>()
// One write at a time per job, so a reader never meets a file half rewritten by a later update.
const writes = new Map<string, Promise<void>>()
function persist(job: JobState): Promise<void> {
  const next = (writes.get(job.id) ?? Promise.resolve()).then(() => storage().setItem(`${job.id}.json`, { ...job }))
  writes.set(job.id, next.catch(() => {}))
  return next
}

// Long work (hundreds of labels, a big CSV) runs as a job: the request returns its id at once, the
// work yields to the event loop between chunks, and the client polls its progress.
export async function startJob<R>(kind: string, owner: { siteId: string, userId: string }, total: number,
  work: (progress: (done: number) => Promise<void>, jobId: string) => Promise<R>): Promise<JobState<R>> {
  const job: JobState<R> = { id: randomUUID(), kind, ...owner, status: 'running', done: 0, total, message: null, result: null, createdAt: new Date().toISOString() }
  live.set(job.id, job)
  await persist(job)
  let last = 0
  const progress = async (done: number) => {
    job.done = done
    if (done - last >= Math.max(1, Math.floor(total / 20)) || done === total) {
      last = done
      await persist(job)
    }
    await new Promise(resolve => setImmediate(resolve))
  }
  void (async () => {
    try {
      job.result = await work(progress, job.id)
      job.status = 'done'
      job.done = total
    }
    catch (error) {
      job.status = 'failed'
      job.message = jobFailureMessage(kind, job.id, error)
      // the whole error (a database message, a stack) goes to the server log only
      console.error(`job ${job.id} (${kind}) failed:`, error)
    }
    await persist(job)
    // finished jobs are read from storage from now on
    setTimeout(() => live.delete(job.id), 60_000).unref?.()
  })()
  return job
}

const JOB_FAILED: Record<string, string> = {
  import: 'The import stopped and nothing was imported. Check the file again (someone may have added the same records meanwhile) and run it again.',
  labels: 'The label sheet could not be made. Try again.',
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
  if (!/^[0-9a-f-]{36}$/.test(id)) throw createError({ statusCode: 404, message: 'No such job.' })
  const stored = live.get(id) ?? await storage().getItem<JobState<R>>(`${id}.json`).catch(() => null)
  const job = (stored && typeof stored === 'object' ? stored : null) as JobState<R> | null
  if (!job || job.userId !== userId) throw createError({ statusCode: 404, message: 'No such job.' })
  return job
}

export const saveJobBlob = (id: string, data: Uint8Array) => storage().setItemRaw(`${id}.bin`, data)
export const readJobBlob = (id: string) => storage().getItemRaw<Uint8Array>(`${id}.bin`)
