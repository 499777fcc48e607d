/**
 * A pool of Node worker threads that run render jobs (jobs.ts), for the
 * command line (a Node shell, like the other node-*.ts files here): it is both
 * the pool (main thread) and the worker's entry (this same module loaded in a
 * worker, recognised by its workerData; see node-boot.ts for how it loads).
 */
import { availableParallelism } from 'node:os';
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import { workerBootCode } from './node-boot.ts';
import { JobQueue } from './job-queue.ts';
import { errorFromData, errorToData, runRenderJob, type ErrorData, type JobRunner, type RenderJob, type RenderJobResult } from './jobs.ts';

const ROLE = 'glowtalk-render-worker';

interface Request {
  id: number;
  job: RenderJob;
}
type Reply = { id: number; ok: true; result: RenderJobResult } | { id: number; ok: false; error: ErrorData };

/** As many workers as the machine has cores (at least 1). */
export function defaultWorkerCount(): number {
  return Math.max(1, availableParallelism());
}

export class NodePool implements JobRunner {
  private readonly workers: Worker[] = [];
  private readonly queue: JobQueue;
  private closed = false;

  constructor(readonly size: number) {
    if (!Number.isInteger(size) || size < 1) throw new RangeError(`NodePool size must be a whole number of at least 1, got ${size}`);
    const code = workerBootCode(import.meta.url);
    this.queue = new JobQueue(size, (slot, id, job) => this.workers[slot].postMessage({ id, job } satisfies Request));
    for (let slot = 0; slot < size; slot++) {
      const worker = new Worker(code, { eval: true, workerData: { role: ROLE } });
      worker.on('message', (reply: Reply) =>
        this.queue.settle(slot, reply.id, reply.ok ? { ok: true, result: reply.result } : { ok: false, error: errorFromData(reply.error) }),
      );
      worker.on('error', (error) => this.queue.stop(error instanceof Error ? error : new Error(String(error))));
      worker.on('exit', (code) => {
        if (!this.closed) this.queue.stop(new Error(`a render worker stopped unexpectedly (exit code ${code})`));
      });
      this.workers.push(worker);
    }
  }

  run(job: RenderJob): Promise<RenderJobResult> {
    if (this.closed) return Promise.reject(new Error('the render pool is closed'));
    return this.queue.run(job);
  }

  /** Stops every worker; jobs still waiting or running fail rather than wait for ever. */
  async close(): Promise<void> {
    this.closed = true;
    this.queue.stop(new Error('the render pool was closed before this job finished'));
    await Promise.all(this.workers.map((worker) => worker.terminate()));
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
