import { index, integer, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { sites, users } from './core'
import { id, timestamps } from './shared'

// 'running' covers waiting in the queue too: the client polls until a job is done or failed.
export const jobStatusEnum = pgEnum('job_status', ['running', 'done', 'failed'])

// Long work (label sheets, CSV imports) as a row its owner polls: progress and result live here, any app
// server's worker runs it (the queue itself is pg-boss, in its own schema), and a result file goes to the
// storage layer under `jobs:<id>`. `attempt` names the run that owns the row: a run that was given up
// after the time limit and started again elsewhere cannot write over the newer one.
export const backgroundJobs = pgTable('background_jobs', {
  id: id(),
  kind: text().notNull(),
  siteId: uuid().notNull().references(() => sites.id),
  userId: uuid().notNull().references(() => users.id),
  status: jobStatusEnum().notNull().default('running'),
  done: integer().notNull().default(0),
  total: integer().notNull(),
  /** what the worker needs (the label items, the CSV rows); dropped when the job ends */
  input: jsonb(),
  result: jsonb(),
  /** the plain sentence its owner reads when it failed */
  message: text(),
  attempt: integer().notNull().default(0),
  /** the app server (host:pid) that took the latest attempt: whose log to read */
  ranOn: text(),
  startedAt: timestamp({ withTimezone: true }),
  finishedAt: timestamp({ withTimezone: true }),
  ...timestamps,
}, t => [index().on(t.userId, t.createdAt), index().on(t.siteId), index().on(t.status, t.finishedAt)])
