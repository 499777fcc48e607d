/**
 * The page's side of the render worker: one render at a time; a new render
 * or a cancel terminates the running worker (a render is one synchronous
 * call in the worker, so it cannot read a cancel message) and the next render
 * starts a fresh one.
 */
import type { BiasTables, RenderRequest, RenderedLink, WorkerReply } from '../../src/worker/messages.ts';

export interface RenderCallbacks {
  onBias(bias: BiasTables): void;
  onProgress(fraction: number): void;
}

/** A render that ended without a result: cancelled, or failed with the worker's message. */
export class RenderFailure extends Error {
  constructor(
    message: string,
    readonly where: string | null,
    readonly cancelled: boolean,
  ) {
    super(message);
    this.name = 'RenderFailure';
  }
}

export class RenderClient {
  private worker: Worker | null = null;
  private nextId = 1;
  private pending: { id: number; reject: (error: RenderFailure) => void } | null = null;

  get busy(): boolean {
    return this.pending !== null;
  }

  render(request: Omit<RenderRequest, 'kind' | 'id'>, callbacks: RenderCallbacks): Promise<RenderedLink> {
    this.cancel();
    const id = this.nextId++;
    const worker = this.ensureWorker();
    return new Promise<RenderedLink>((resolve, reject) => {
      this.pending = { id, reject };
      worker.onmessage = (event: MessageEvent<WorkerReply>) => {
        const message = event.data;
        if (message.id !== id) return;
        switch (message.kind) {
          case 'bias':
            callbacks.onBias(message.bias);
            break;
          case 'progress':
            callbacks.onProgress(message.fraction);
            break;
          case 'done':
            this.pending = null;
            resolve(message.result);
            break;
          case 'failed':
            this.pending = null;
            reject(new RenderFailure(message.message, message.where, false));
            break;
        }
      };
      worker.onerror = (event) => {
        event.preventDefault();
        this.pending = null;
        this.drop();
        reject(new RenderFailure(`internal error in the render worker (please report it): ${event.message}`, null, false));
      };
      const full: RenderRequest = { kind: 'render', id, ...request };
      // The recording is copied, not transferred: the page keeps its own for the next render.
      worker.postMessage(full);
    });
  }

  /** Stops the running render, if any; its promise rejects as cancelled. */
  cancel(): void {
    if (!this.pending) return;
    const { reject } = this.pending;
    this.pending = null;
    this.drop();
    reject(new RenderFailure('render cancelled', null, true));
  }

  dispose(): void {
    this.cancel();
    this.drop();
  }

  private ensureWorker(): Worker {
    this.worker ??= new Worker(new URL('../../src/worker/render-worker.ts', import.meta.url), { type: 'module', name: 'glowtalk-render' });
    return this.worker;
  }

  private drop(): void {
    this.worker?.terminate();
    this.worker = null;
  }
}
