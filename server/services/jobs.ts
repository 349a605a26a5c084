import { Op } from 'sequelize';
import { LabelBatch, StudyRun } from '../db/models';
import { log } from '../log';

/**
 * Background work inside the server process: study runs and label print batches. Both share one lifecycle:
 * queued → running → done | failed, the state in the database (a client can leave and come back, and polls until
 * done or failed). A job left queued or running by a server that died is marked failed, with the reason, when a
 * server starts (`failInterruptedJobs`); a stopping server asks its jobs to stop (`signal`), waits for them
 * (`drain`) and marks failed whatever is still running when its time is up (`failOwnJobs`).
 */
export type JobKind = 'study-run' | 'label-batch';
export interface JobRef {
  kind: JobKind;
  id: string;
}

/** Why a job failed when the server stopped under it (shown to the user as the job's message). */
export const INTERRUPTED_BY_RESTART: Record<JobKind, string> = {
  'study-run': 'Interrupted by a server restart; run the study again',
  'label-batch': 'Interrupted by a server restart; make the print batch again',
};
export const STOPPED_BY_SHUTDOWN: Record<JobKind, string> = {
  'study-run': 'Stopped: the server was shut down while the study ran; run the study again',
  'label-batch': 'Stopped: the server was shut down while the PDF was made; make the print batch again',
};

/** Thrown inside a job that sees the server stopping; the job's own failure path records the message. */
export class JobStopped extends Error {}

export class Jobs {
  private readonly running = new Map<Promise<void>, JobRef | undefined>();
  private readonly controller = new AbortController();

  start(job: () => Promise<void>, ref?: JobRef): void {
    const p: Promise<void> = Promise.resolve()
      .then(job)
      .catch((err: unknown) => log.error({ err, job: ref }, 'background job failed'))
      .finally(() => this.running.delete(p));
    this.running.set(p, ref);
  }

  /** Aborted when the server begins to stop. */
  get signal(): AbortSignal {
    return this.controller.signal;
  }

  get stopping(): boolean {
    return this.controller.signal.aborted;
  }

  /** Long jobs call this between steps: once the server is stopping it throws, and the job fails itself. */
  throwIfStopping(kind: JobKind): void {
    if (this.stopping) throw new JobStopped(STOPPED_BY_SHUTDOWN[kind]);
  }

  async idle(): Promise<void> {
    while (this.running.size) await Promise.all([...this.running.keys()]);
  }

  /** Asks every job to stop and waits for them: true when none is left within the time, false otherwise. */
  async drain(timeoutMs: number): Promise<boolean> {
    this.controller.abort();
    let timer: NodeJS.Timeout | undefined;
    const timedOut = new Promise<false>((resolve) => (timer = setTimeout(() => resolve(false), timeoutMs)));
    try {
      return await Promise.race([this.idle().then(() => true as const), timedOut]);
    } finally {
      clearTimeout(timer);
    }
  }

  /** The jobs of this process still running (those with a database row). */
  get refs(): JobRef[] {
    return [...this.running.values()].filter((r): r is JobRef => !!r);
  }

  get size(): number {
    return this.running.size;
  }
}

const UNFINISHED = { [Op.in]: ['queued', 'running'] };

/**
 * At start: every study run and print batch left queued or running (by a server that was killed or lost power) is
 * marked failed with the reason; the user starts it again.
 */
export async function failInterruptedJobs(now: Date): Promise<{ runs: number; batches: number }> {
  const [runs] = await StudyRun.update(
    { status: 'failed', message: INTERRUPTED_BY_RESTART['study-run'], finishedAt: now },
    { where: { status: UNFINISHED } },
  );
  const [batches] = await LabelBatch.update(
    { status: 'failed', message: INTERRUPTED_BY_RESTART['label-batch'] },
    { where: { status: UNFINISHED } },
  );
  return { runs, batches };
}

/** At a shutdown that ran out of time: this process's unfinished jobs are marked failed with the reason. */
export async function failOwnJobs(jobs: Jobs, now: Date): Promise<number> {
  let count = 0;
  for (const ref of jobs.refs) {
    const where = { id: ref.id, status: UNFINISHED };
    const [n] =
      ref.kind === 'study-run'
        ? await StudyRun.update(
            { status: 'failed', message: STOPPED_BY_SHUTDOWN[ref.kind], finishedAt: now },
            { where },
          )
        : await LabelBatch.update({ status: 'failed', message: STOPPED_BY_SHUTDOWN[ref.kind] }, { where });
    count += n;
  }
  return count;
}

/** Lets the event loop breathe between chunks of a long computation. */
export const yieldToLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));
