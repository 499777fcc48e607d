import type { RenderJob, RenderJobResult } from './jobs.ts';

interface Pending {
  id: number;
  job: RenderJob;
  resolve: (result: RenderJobResult) => void;
  reject: (error: Error) => void;
}

/**
 * The bookkeeping of a worker pool, shared by the Node pool and the page's pool:
 * jobs wait in order, each free worker takes the next one, a reply settles the
 * job its worker holds, and a stop fails everything waiting or running (and
 * every later job) with the reason. How a job reaches a worker is the pool's.
 */
export class JobQueue {
  private readonly busy: Array<Pending | null>;
  private readonly waiting: Pending[] = [];
  private nextId = 0;
  private stopped: Error | null = null;

  constructor(
    workers: number,
    /** Sends job `id` to worker number `slot`. */
    private readonly send: (slot: number, id: number, job: RenderJob) => void,
  ) {
    this.busy = Array.from({ length: workers }, () => null);
  }

  run(job: RenderJob): Promise<RenderJobResult> {
    if (this.stopped) return Promise.reject(this.stopped);
    return new Promise((resolve, reject) => {
      this.waiting.push({ id: this.nextId++, job, resolve, reject });
      this.dispatch();
    });
  }

  /** Worker `slot` answered job `id`. */
  settle(slot: number, id: number, outcome: { ok: true; result: RenderJobResult } | { ok: false; error: Error }): void {
    const pending = this.busy[slot];
    if (!pending || pending.id !== id) return;
    this.busy[slot] = null;
    if (outcome.ok) pending.resolve(outcome.result);
    else pending.reject(outcome.error);
    this.dispatch();
  }

  /** Fails every job waiting or running, and every later one, with `error` (the first reason stays). */
  stop(error: Error): void {
    if (this.stopped) return;
    this.stopped = error;
    for (let slot = 0; slot < this.busy.length; slot++) {
      this.busy[slot]?.reject(error);
      this.busy[slot] = null;
    }
    for (const pending of this.waiting.splice(0)) pending.reject(error);
  }

  get isStopped(): boolean {
    return this.stopped !== null;
  }

  private dispatch(): void {
    for (let slot = 0; slot < this.busy.length; slot++) {
      if (this.busy[slot] || this.waiting.length === 0) continue;
      const pending = this.waiting.shift()!;
      this.busy[slot] = pending;
      this.send(slot, pending.id, pending.job);
    }
  }
}
