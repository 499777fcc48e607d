/**
 * A small pool of module Web Workers that run analysis jobs (src/worker/jobs.ts)
 * for the Margins tab: the page's counterpart of the command line's
 * node-pool.ts, so findHeadroom, runSweep and runTolerance run unchanged.
 * The workers are the render worker (it takes JobRequests too). A job is one
 * synchronous call in its worker, so cancelling terminates every worker and
 * fails the jobs waiting or running with a PoolCancelled error (not a user
 * error, so runAll stops the whole batch).
 */
import { errorFromData, type JobRunner, type RenderJob, type RenderJobResult } from '../../src/worker/jobs.ts';
import type { JobReply, JobRequest } from '../../src/worker/messages.ts';
import { JobQueue } from '../../src/worker/job-queue.ts';

/** The error of every job a cancel stopped. */
export class PoolCancelled extends Error {
  constructor() {
    super('cancelled');
    this.name = 'PoolCancelled';
  }
}

/** min(2, cores): two renders side by side keep the page responsive on small machines. */
export function marginWorkerCount(): number {
  return Math.max(1, Math.min(2, navigator.hardwareConcurrency || 1));
}

export class BrowserPool implements JobRunner {
  private readonly workers: Worker[] = [];
  private readonly queue: JobQueue;

  constructor(readonly size: number = marginWorkerCount()) {
    this.queue = new JobQueue(size, (slot, id, job) => this.workers[slot].postMessage({ kind: 'job', id, job } satisfies JobRequest));
    for (let slot = 0; slot < size; slot++) {
      const worker = new Worker(new URL('../../src/worker/render-worker.ts', import.meta.url), { type: 'module', name: `glowtalk-margins-${slot + 1}` });
      worker.onmessage = (event: MessageEvent<JobReply>) => {
        const reply = event.data;
        this.queue.settle(slot, reply.id, reply.kind === 'job-done' ? { ok: true, result: reply.result } : { ok: false, error: errorFromData(reply.error) });
      };
      worker.onerror = (event) => {
        event.preventDefault();
        this.stop(new Error(`internal error in an analysis worker (please report it): ${event.message}`));
      };
      this.workers.push(worker);
    }
  }

  run(job: RenderJob): Promise<RenderJobResult> {
    return this.queue.run(job);
  }

  /** Stops every worker; jobs waiting or running reject with PoolCancelled. */
  cancel(): void {
    this.stop(new PoolCancelled());
  }

  async close(): Promise<void> {
    this.stop(new Error('the analysis pool was closed before this job finished'));
  }

  private stop(error: Error): void {
    if (this.queue.isStopped) return;
    for (const worker of this.workers) worker.terminate();
    this.queue.stop(error);
  }
}
