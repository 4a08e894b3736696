export interface JobProgress { done: number, total: number, status: 'running' | 'done' | 'failed', message?: string | null }

/**
 * A server job started by a POST that answers `{ id, total }`, followed on /api/jobs/<id> until it is done or
 * failed. `run` resolves with the job's id when it is done, or null (the reason is in `problem`).
 */
export function useJob(pollMs = 500) {
  const progress = ref<JobProgress | null>(null)
  const problem = ref('')

  async function run(url: string, body: Record<string, unknown>, failedWords: (p: JobProgress) => string): Promise<string | null> {
    problem.value = ''
    try {
      const job = await $fetch<{ id: string, total: number }>(url, { method: 'POST', body })
      progress.value = { done: 0, total: job.total, status: 'running' }
      while (progress.value.status === 'running') {
        await new Promise(r => setTimeout(r, pollMs))
        progress.value = await $fetch<JobProgress>(`/api/jobs/${job.id}`)
      }
      if (progress.value.status === 'done') return job.id
      problem.value = failedWords(progress.value)
    }
    catch (error) {
      problem.value = errorMessage(error)
      progress.value = null
    }
    return null
  }

  return { progress, problem, run }
}
