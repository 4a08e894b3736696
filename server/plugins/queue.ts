import { auditPackJob } from '../utils/audit-pack/job'

// Every app server runs the same things: the listening connection that keeps rights and revisions in
// memory (change-feed.ts), and workers of the job queue (queue.ts) for each kind of job and each timed
// task. Timed tasks are schedules of the queue, so each runs once per cluster, whichever server's
// worker takes it. A new kind of job goes in JOB_KINDS; a new timed task in TIMED below.

const JOB_KINDS = () => [labelSheetJob, assetImportJob, auditPackJob]

// BAYWARD_MAIL_TICK_SECONDS (60) rounded up to whole minutes, the schedule's grain; 0 turns it off.
function mailTickMinutes(): number {
  const seconds = Number(process.env.BAYWARD_MAIL_TICK_SECONDS ?? 60)
  return seconds > 0 ? Math.max(1, Math.min(59, Math.ceil(seconds / 60))) : 0
}

export default defineNitroPlugin((nitroApp) => {
  const databaseUrl = useRuntimeConfig().databaseUrl as string
  const feed = startChangeFeed(databaseUrl)
  registerJobKinds(JOB_KINDS())
  onChange((kind) => {
    if (kind === 'j') wakeWorkers(JOB_QUEUE)
  })

  const minutes = mailTickMinutes()
  const everyTick = minutes ? `*/${minutes} * * * *` : null
  const TIMED: Record<string, { cron: string | null, run: () => Promise<unknown> }> = {
    // the outbox: messages whose delivery failed, or whose server stopped before sending them
    'mail-retry': { cron: everyTick, run: () => deliverDueMail() },
    // each site's daily digest, from its digest hour
    'mail-digest': { cron: process.env.BAYWARD_DIGEST_DISABLED === 'true' ? null : everyTick, run: () => sendDigests() },
    // finished jobs and their files after a week
    'jobs-cleanup': { cron: '17 3 * * *', run: () => dropOldJobs() },
  }

  const queue = startQueue(databaseUrl, {
    queues: {
      [LOST_JOB_QUEUE]: { expireInSeconds: 60, retryLimit: 2 },
      // a job still running after the time limit is taken as lost: tried once more (on any server), then failed
      [JOB_QUEUE]: { expireInSeconds: jobTimeoutSeconds(), retryLimit: 1, deadLetter: LOST_JOB_QUEUE },
      ...Object.fromEntries(Object.keys(TIMED).map(name => [name, { expireInSeconds: 600, retryLimit: 0, policy: 'singleton' as const }])),
    },
    workers: {
      [JOB_QUEUE]: { run: runQueuedJob, concurrency: Math.max(1, Number(process.env.BAYWARD_JOB_CONCURRENCY ?? 2)) },
      [LOST_JOB_QUEUE]: { run: failLostJob, pollSeconds: 5 },
      ...Object.fromEntries(Object.entries(TIMED).map(([name, task]) => [name, { run: async () => void await task.run(), pollSeconds: 5 }])),
    },
    schedules: Object.fromEntries(Object.entries(TIMED).map(([name, task]) => [name, task.cron])),
  })

  nitroApp.hooks.hook('close', async () => {
    await queue.stop()
    await feed.stop()
  })
})
