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

interface Pending {
  id: number;
  job: RenderJob;
  resolve: (result: RenderJobResult) => void;
  reject: (error: Error) => void;
}

interface Slot {
  worker: Worker;
  busy: Pending | null;
}

export class BrowserPool implements JobRunner {
  private readonly slots: Slot[] = [];
  private readonly queue: Pending[] = [];
  private nextId = 1;
  private stopped: Error | null = null;

  constructor(readonly size: number = marginWorkerCount()) {
    for (let i = 0; i < size; i++) {
      const worker = new Worker(new URL('../../src/worker/render-worker.ts', import.meta.url), { type: 'module', name: `glowtalk-margins-${i + 1}` });
      const slot: Slot = { worker, busy: null };
      worker.onmessage = (event: MessageEvent<JobReply>) => this.settle(slot, event.data);
      worker.onerror = (event) => {
        event.preventDefault();
        this.stop(new Error(`internal error in an analysis worker (please report it): ${event.message}`));
      };
      this.slots.push(slot);
    }
  }

  run(job: RenderJob): Promise<RenderJobResult> {
    if (this.stopped) return Promise.reject(this.stopped);
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, job, resolve, reject });
      this.dispatch();
    });
  }

  /** Stops every worker; jobs waiting or running reject with PoolCancelled. */
  cancel(): void {
    this.stop(new PoolCancelled());
  }

  async close(): Promise<void> {
    this.stop(new Error('the analysis pool was closed before this job finished'));
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (slot.busy || this.queue.length === 0) continue;
      const pending = this.queue.shift()!;
      slot.busy = pending;
      const request: JobRequest = { kind: 'job', id: pending.id, job: pending.job };
      slot.worker.postMessage(request);
    }
  }

  private settle(slot: Slot, reply: JobReply): void {
    const pending = slot.busy;
    if (!pending || pending.id !== reply.id) return;
    slot.busy = null;
    if (reply.kind === 'job-done') pending.resolve(reply.result);
    else pending.reject(errorFromData(reply.error));
    this.dispatch();
  }

  private stop(error: Error): void {
    if (this.stopped) return;
    this.stopped = error;
    for (const slot of this.slots) {
      slot.worker.terminate();
      slot.busy?.reject(error);
      slot.busy = null;
    }
    for (const pending of this.queue.splice(0)) pending.reject(error);
  }
}
