// Long work as jobs in MariaDB. Any app instance may run any job: a runner claims the oldest
// runnable row with SELECT … FOR UPDATE SKIP LOCKED (two instances never take the same one and
// never wait on each other), keeps a heartbeat while it works, and records progress, the result
// link or the error. A job whose heartbeat stopped (its instance was killed) is runnable again;
// after MAX_ATTEMPTS such restarts it is marked failed instead, so a job that kills its
// instance cannot take the others down one after another.
import { hostname } from "node:os";
import { randomBytes } from "node:crypto";
import { QueryTypes } from "sequelize";
import { Job } from "../../db/models";
import { db } from "../utils/db.server";
import { errorToProblem } from "../utils/api.server";
import { problem } from "../utils/http.server";
import { getEnv } from "../utils/env.server";
import { engineProcessCount } from "../utils/worker-pool.server";
import type { Actor } from "./audit.server";
import { NotFoundError } from "./errors.server";
import { emitWebhookEventQuietly } from "./webhooks.server";

export const MAX_ATTEMPTS = 3;

export interface JobContext {
  /** The job's own id (for links to its result). */
  jobId: number;
  /** The actor who asked for the work. */
  actor: Actor;
  /** Share done, 0–1 (written to the row at most twice a second). */
  progress(share: number): void;
}

export interface JobOutcome {
  resultUrl?: string;
  /** A short summary, shown with the job. */
  result?: Record<string, unknown>;
  /** A full result kept with the job and served at /api/v1/jobs/{id}/result (not shown with the job). */
  output?: Record<string, unknown>;
}

export type JobHandler = (input: Record<string, unknown>, context: JobContext) => Promise<JobOutcome>;

const handlers = new Map<string, JobHandler>();

/** Says how to run jobs of a kind; the runner claims only kinds it has a handler for. */
export function registerJobHandler(kind: string, handler: JobHandler): void {
  handlers.set(kind, handler);
}

/** This process, as written in claimed_by. */
export const INSTANCE_ID = `${hostname()}:${process.pid}:${randomBytes(3).toString("hex")}`;

export async function enqueueJob(actor: Actor, kind: string, input: Record<string, unknown>): Promise<Job> {
  db();
  const job = await Job.create({ organisationId: actor.organisationId, kind, input, createdBy: actor.id });
  ensureJobRunner()?.kick();
  return job;
}

export async function getJob(organisationId: number, id: number): Promise<Job> {
  db();
  const job = await Job.findOne({ where: { id, organisationId }, attributes: { exclude: ["input"] } });
  if (!job) throw new NotFoundError(`Job ${id}`);
  return job;
}

/** A job's result without the full output (that one is served at the result link). */
function summaryOf(result: Record<string, unknown>): Record<string, unknown> {
  const { output: _output, ...summary } = result;
  return summary;
}

/** The full output of a finished job (a stateless feasibility study's results). */
export async function jobOutput(organisationId: number, id: number): Promise<Record<string, unknown>> {
  db();
  const job = await Job.findOne({ where: { id, organisationId }, attributes: ["id", "state", "result"] });
  if (!job) throw new NotFoundError(`Job ${id}`);
  const output = (job.result as { output?: Record<string, unknown> } | null)?.output;
  if (job.state !== "done") throw problem(409, "Job not finished", `Job ${id} is ${job.state}; its result is here once it is done.`, { state: job.state });
  if (!output) throw new NotFoundError(`A result of job ${id} at this address (see its resultUrl)`);
  return output;
}

/** The job resource of the API (issue 12): state, progress and, when done, the result link. */
export function jobJson(job: Job) {
  return {
    id: job.id,
    kind: job.kind,
    state: job.state,
    progress: job.progress,
    resultUrl: job.resultUrl ?? null,
    result: job.result ? summaryOf(job.result) : null,
    error: job.error ?? null,
    attempts: job.attempts,
    createdAt: job.createdAt.toISOString(),
    startedAt: job.startedAt?.toISOString() ?? null,
    finishedAt: job.finishedAt?.toISOString() ?? null,
  };
}

/**
 * Claims the oldest runnable job of the given kinds for `instance`: queued, or running with a
 * heartbeat older than `staleSeconds`. Returns null when there is none (or all are locked by
 * other claimers at this moment).
 */
export async function claimNextJob(instance: string, kinds: string[], staleSeconds: number): Promise<Job | null> {
  if (kinds.length === 0) return null;
  const sequelize = db();
  for (;;) {
    const outcome = await sequelize.transaction(async (transaction) => {
      // Sequelize's MariaDB dialect drops `skipLocked`, so the claiming SELECT is written out
      // (bound parameters only); MariaDB ≥ 10.6 supports SKIP LOCKED.
      const [row] = await sequelize.query<{ id: number }>(
        `SELECT id FROM jobs
          WHERE kind IN (:kinds)
            AND (state = 'queued' OR (state = 'running' AND heartbeat_at < :staleBefore))
          ORDER BY id LIMIT 1
          FOR UPDATE SKIP LOCKED`,
        { replacements: { kinds, staleBefore: new Date(Date.now() - staleSeconds * 1000) }, type: QueryTypes.SELECT, transaction },
      );
      const job = row ? await Job.findByPk(row.id, { transaction }) : null;
      if (!job) return { job: null };
      const now = new Date();
      if (job.state === "running" && job.attempts >= MAX_ATTEMPTS) {
        const detail = `The app instance running this job stopped ${job.attempts} times before it finished; it was not tried again.`;
        const error = { status: 500, title: "Job abandoned", detail };
        await job.update({ state: "failed", error, finishedAt: now }, { transaction });
        transaction.afterCommit(() => emitWebhookEventQuietly(job.organisationId, "job.failed", { jobId: job.id, kind: job.kind, error, url: `/api/v1/jobs/${job.id}` }));
        return { retry: true };
      }
      await job.update({ state: "running", claimedBy: instance, heartbeatAt: now, startedAt: job.startedAt ?? now, attempts: job.attempts + 1 }, { transaction });
      return { job };
    });
    if (!("retry" in outcome)) return outcome.job;
  }
}

/** Writes progress and the heartbeat, only while this instance still holds the job. */
export async function touchJob(id: number, instance: string, progress?: number): Promise<boolean> {
  db();
  const [changed] = await Job.update(
    { heartbeatAt: new Date(), ...(progress === undefined ? {} : { progress }) },
    { where: { id, claimedBy: instance, state: "running" } },
  );
  return changed > 0;
}

export async function completeJob(id: number, instance: string, outcome: JobOutcome): Promise<boolean> {
  db();
  const [changed] = await Job.update(
    {
      state: "done",
      progress: 1,
      resultUrl: outcome.resultUrl ?? null,
      result: outcome.result || outcome.output ? { ...outcome.result, ...(outcome.output ? { output: outcome.output } : {}) } : null,
      finishedAt: new Date(),
      heartbeatAt: new Date(),
    },
    { where: { id, claimedBy: instance, state: "running" } },
  );
  return changed > 0;
}

/** Records the failure as problem+json (the same mapping as the API's errors). */
export async function failJob(id: number, instance: string, error: unknown): Promise<boolean> {
  db();
  const problem = (await errorToProblem(error).json()) as { status: number; title: string; detail: string; errors?: { path: string; message: string }[] };
  const error_ = { status: problem.status, title: problem.title, detail: problem.detail, ...(problem.errors ? { errors: problem.errors } : {}) };
  const [changed] = await Job.update({ state: "failed", error: error_, finishedAt: new Date() }, { where: { id, claimedBy: instance, state: "running" } });
  if (changed > 0) {
    // Tells the organisation's webhooks (job.failed).
    const job = await Job.findByPk(id, { attributes: ["id", "organisationId", "kind"] });
    if (job) emitWebhookEventQuietly(job.organisationId, "job.failed", { jobId: job.id, kind: job.kind, error: error_, url: `/api/v1/jobs/${job.id}` });
  }
  return changed > 0;
}

/** Runs one claimed job to its end: heartbeat while it works, then done or failed. */
export async function runClaimedJob(job: Job, instance: string, heartbeatMs: number): Promise<void> {
  const handler = handlers.get(job.kind);
  let lastWrite = 0;
  let pending: Promise<unknown> = Promise.resolve();
  const beat = setInterval(() => (pending = pending.then(() => touchJob(job.id, instance)).catch(() => undefined)), heartbeatMs);
  try {
    if (!handler) throw new Error(`No handler for jobs of kind ${job.kind}.`);
    const outcome = await handler(job.input, {
      jobId: job.id,
      actor: { id: job.createdBy, organisationId: job.organisationId },
      progress: (share) => {
        const now = Date.now();
        if (now - lastWrite < 500) return;
        lastWrite = now;
        pending = pending.then(() => touchJob(job.id, instance, Math.min(0.99, share))).catch(() => undefined);
      },
    });
    clearInterval(beat);
    await pending;
    await completeJob(job.id, instance, outcome);
  } catch (error) {
    clearInterval(beat);
    await pending;
    await failJob(job.id, instance, error);
  }
}

interface Runner {
  kick(): void;
  stop(): void;
}

let runner: Runner | null = null;

/**
 * Starts this process's job runner once (no-op when JOB_RUNNER=false): it polls for runnable
 * jobs and runs up to one per engine worker thread at a time.
 */
export function ensureJobRunner(): Runner | null {
  const env = getEnv();
  if (!env.JOB_RUNNER) return null;
  runner ??= createRunner({ pollMs: env.JOB_POLL_MS, staleSeconds: env.JOB_STALE_SECONDS, concurrency: Math.max(1, engineProcessCount()) });
  return runner;
}

/**
 * Stops claiming jobs and puts the ones running here back in the queue, so another instance (or
 * this one after a restart) runs them at once instead of after the stale-heartbeat delay. The
 * server calls it on shutdown, before it stops the worker pool.
 */
export async function stopJobRunner(): Promise<void> {
  const stopping = runner;
  runner = null;
  if (!stopping) return;
  stopping.stop();
  db();
  await Job.update({ state: "queued", claimedBy: null, heartbeatAt: null }, { where: { claimedBy: INSTANCE_ID, state: "running" } });
}

function createRunner(options: { pollMs: number; staleSeconds: number; concurrency: number }): Runner {
  const running = new Set<Promise<void>>();
  let ticking = false;
  let stopped = false;
  let warned = false;
  const heartbeatMs = Math.max(200, (options.staleSeconds * 1000) / 3);

  async function tick() {
    if (ticking || stopped) return;
    ticking = true;
    try {
      while (!stopped && running.size < options.concurrency) {
        const job = await claimNextJob(INSTANCE_ID, [...handlers.keys()], options.staleSeconds);
        if (!job) break;
        const run = runClaimedJob(job, INSTANCE_ID, heartbeatMs).finally(() => {
          running.delete(run);
          void tick();
        });
        running.add(run);
      }
      warned = false;
    } catch (error) {
      // The database may be away for a while; say so once, keep polling.
      if (!warned) console.error("Job runner: could not claim jobs:", (error as Error).message);
      warned = true;
    } finally {
      ticking = false;
    }
  }

  const timer = setInterval(() => void tick(), options.pollMs);
  timer.unref();
  void tick();
  return {
    kick: () => void tick(),
    stop() {
      stopped = true;
      clearInterval(timer);
    },
  };
}
