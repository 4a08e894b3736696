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

// Long work (hundreds of labels, a big CSV) runs as a job: the request returns its id at once, the
// work yields to the event loop between chunks, and the client polls its progress.
export async function startJob<R>(kind: string, owner: { siteId: string, userId: string }, total: number,
  work: (progress: (done: number) => Promise<void>, jobId: string) => Promise<R>): Promise<JobState<R>> {
  const job: JobState<R> = { id: randomUUID(), kind, ...owner, status: 'running', done: 0, total, message: null, result: null, createdAt: new Date().toISOString() }
  await storage().setItem(`${job.id}.json`, job)
  let last = 0
  const progress = async (done: number) => {
    job.done = done
    if (done - last >= Math.max(1, Math.floor(total / 20)) || done === total) {
      last = done
      await storage().setItem(`${job.id}.json`, job)
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
      job.message = (error as { message?: string }).message ?? 'The job failed.'
    }
    await storage().setItem(`${job.id}.json`, job)
  })()
  return job
}

export async function readJob<R = unknown>(id: string, userId: string): Promise<JobState<R>> {
  const job = /^[0-9a-f-]{36}$/.test(id) ? await storage().getItem<JobState<R>>(`${id}.json`) : null
  if (!job || job.userId !== userId) throw createError({ statusCode: 404, message: 'No such job.' })
  return job
}

export const saveJobBlob = (id: string, data: Uint8Array) => storage().setItemRaw(`${id}.bin`, data)
export const readJobBlob = (id: string) => storage().getItemRaw<Uint8Array>(`${id}.bin`)
