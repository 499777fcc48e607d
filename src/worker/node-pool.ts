/**
 * A pool of Node worker threads that run render jobs (jobs.ts), for the
 * command line. The only file here that uses Node APIs: it is both the pool
 * (main thread) and the worker's entry (this same module loaded in a worker,
 * recognised by its workerData). Workers load TypeScript through tsx's ESM
 * API, registered inside the worker before this module is imported: passing
 * `--import tsx` in a worker's execArgv does not reach the worker's own entry
 * module on Node 20 (tried here: "Unknown file extension .ts").
 */
import { availableParallelism } from 'node:os';
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import { errorFromData, errorToData, runRenderJob, type ErrorData, type JobRunner, type RenderJob, type RenderJobResult } from './jobs.ts';

const ROLE = 'glowtalk-render-worker';

interface Request {
  id: number;
  job: RenderJob;
}
type Reply = { id: number; ok: true; result: RenderJobResult } | { id: number; ok: false; error: ErrorData };

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

/** As many workers as the machine has cores (at least 1). */
export function defaultWorkerCount(): number {
  return Math.max(1, availableParallelism());
}

/** The code a worker starts with: register tsx when the source is TypeScript, then load this module. */
function bootCode(): string {
  const self = import.meta.url;
  if (!/\.[cm]?ts$/.test(new URL(self).pathname)) return `import(${JSON.stringify(self)});`;
  const tsx = import.meta.resolve('tsx/esm/api');
  return `import(${JSON.stringify(tsx)}).then((api) => { api.register(); return import(${JSON.stringify(self)}); });`;
}

export class NodePool implements JobRunner {
  private readonly slots: Slot[] = [];
  private readonly queue: Pending[] = [];
  private nextId = 0;
  private failure: Error | null = null;
  private closed = false;

  constructor(readonly size: number) {
    if (!Number.isInteger(size) || size < 1) throw new RangeError(`NodePool size must be a whole number of at least 1, got ${size}`);
    const code = bootCode();
    for (let i = 0; i < size; i++) {
      const slot: Slot = { worker: new Worker(code, { eval: true, workerData: { role: ROLE } }), busy: null };
      slot.worker.on('message', (reply: Reply) => this.settle(slot, reply));
      slot.worker.on('error', (error) => this.fail(error instanceof Error ? error : new Error(String(error))));
      slot.worker.on('exit', (code) => {
        if (!this.closed) this.fail(new Error(`a render worker stopped unexpectedly (exit code ${code})`));
      });
      this.slots.push(slot);
    }
  }

  run(job: RenderJob): Promise<RenderJobResult> {
    if (this.failure) return Promise.reject(this.failure);
    if (this.closed) return Promise.reject(new Error('the render pool is closed'));
    return new Promise((resolve, reject) => {
      this.queue.push({ id: this.nextId++, job, resolve, reject });
      this.dispatch();
    });
  }

  /** Stops every worker; jobs still waiting or running fail rather than wait for ever. */
  async close(): Promise<void> {
    this.closed = true;
    const stopped = new Error('the render pool was closed before this job finished');
    for (const slot of this.slots) {
      slot.busy?.reject(stopped);
      slot.busy = null;
    }
    for (const pending of this.queue.splice(0)) pending.reject(stopped);
    await Promise.all(this.slots.map((slot) => slot.worker.terminate()));
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (slot.busy || this.queue.length === 0) continue;
      const pending = this.queue.shift()!;
      slot.busy = pending;
      const request: Request = { id: pending.id, job: pending.job };
      slot.worker.postMessage(request);
    }
  }

  private settle(slot: Slot, reply: Reply): void {
    const pending = slot.busy;
    if (!pending || pending.id !== reply.id) return;
    slot.busy = null;
    if (reply.ok) pending.resolve(reply.result);
    else pending.reject(errorFromData(reply.error));
    this.dispatch();
  }

  /** A worker died: every job waiting or running fails with the reason, and so does every later one. */
  private fail(error: Error): void {
    if (this.failure) return;
    this.failure = error;
    for (const slot of this.slots) {
      slot.busy?.reject(error);
      slot.busy = null;
    }
    for (const pending of this.queue.splice(0)) pending.reject(error);
  }
}

// Worker side: answer each request with its result or its error.
if (!isMainThread && (workerData as { role?: string } | null)?.role === ROLE && parentPort) {
  const port = parentPort;
  port.on('message', (request: Request) => {
    let reply: Reply;
    try {
      reply = { id: request.id, ok: true, result: runRenderJob(request.job) };
    } catch (error) {
      reply = { id: request.id, ok: false, error: errorToData(error) };
    }
    port.postMessage(reply);
  });
}
