export interface JobProgress { done: number, total: number, status: 'running' | 'done' | 'failed', message?: string | null }

/**
 * A server job started by a POST that answers `{ id, total }`, followed on /api/jobs/<id> until it is done or
 * failed. `run` resolves with the job's id when it is done, or null (the reason is in `problem`); `follow`
 * follows a job some other request started.
 */
export function useJob(pollMs = 500) {
  const progress = ref<JobProgress | null>(null)
  const problem = ref('')

  /** Follows a job already started until it is done (its id) or failed (null; the reason is in `problem`). */
  async function follow(id: string, total: number, failedWords: (p: JobProgress) => string): Promise<string | null> {
    problem.value = ''
    try {
      progress.value = { done: 0, total, status: 'running' }
      while (progress.value.status === 'running') {
        await new Promise(r => setTimeout(r, pollMs))
        progress.value = await $fetch<JobProgress>(`/api/jobs/${id}`)
      }
      if (progress.value.status === 'done') return id
      problem.value = failedWords(progress.value)
    }
    catch (error) {
      problem.value = errorMessage(error)
      progress.value = null
    }
    return null
  }

  async function run(url: string, body: Record<string, unknown>, failedWords: (p: JobProgress) => string): Promise<string | null> {
    problem.value = ''
    try {
      const job = await $fetch<{ id: string, total: number }>(url, { method: 'POST', body })
      return await follow(job.id, job.total, failedWords)
    }
    catch (error) {
      problem.value = errorMessage(error)
      progress.value = null
    }
    return null
  }

  return { progress, problem, run, follow }
}
