/**
 * One analysis at a time for the Margins tab, as a Lit reactive controller:
 * a fresh worker pool per run (closed at the end), progress, cancel (the pool
 * terminates its workers), and the user's errors kept as a message.
 */
import type { ReactiveController, ReactiveControllerHost } from 'lit';
import { isUserFacing } from '../../src/errors.ts';
import { BrowserPool, PoolCancelled } from './browser-pool.ts';

export type TaskState = 'idle' | 'running' | 'done' | 'failed' | 'cancelled';

export class MarginTask implements ReactiveController {
  state: TaskState = 'idle';
  /** 0…1 */
  progress = 0;
  /** What is running, or how the last run ended. */
  message = '';
  private pool: BrowserPool | null = null;

  constructor(private readonly host: ReactiveControllerHost) {
    host.addController(this);
  }

  get running(): boolean {
    return this.state === 'running';
  }

  hostDisconnected(): void {
    this.pool?.cancel();
  }

  /** Runs `work` on a new pool; `describe(seconds, workers)` gives the line shown when it ends. */
  async run(label: string, work: (pool: BrowserPool, progress: (fraction: number) => void) => Promise<(seconds: number, workers: number) => string>): Promise<void> {
    this.pool?.cancel();
    const pool = new BrowserPool();
    this.pool = pool;
    const startedMs = performance.now();
    this.set('running', 0, `${label} on ${pool.size} worker${pool.size === 1 ? '' : 's'}…`);
    try {
      const describe = await work(pool, (fraction) => {
        if (this.pool === pool) this.set('running', Math.min(1, fraction), this.message);
      });
      if (this.pool !== pool) return;
      this.set('done', 1, describe((performance.now() - startedMs) / 1000, pool.size));
    } catch (error) {
      if (this.pool !== pool) return;
      if (error instanceof PoolCancelled) this.set('cancelled', this.progress, `${label}: cancelled.`);
      else if (isUserFacing(error)) this.set('failed', this.progress, `${label}: ${error.message}`);
      else this.set('failed', this.progress, `${label}: internal error (please report it): ${(error as Error).message ?? String(error)}`);
    } finally {
      if (this.pool === pool) this.pool = null;
      await pool.close();
    }
  }

  cancel(): void {
    this.pool?.cancel();
  }

  private set(state: TaskState, progress: number, message: string): void {
    this.state = state;
    this.progress = progress;
    this.message = message;
    this.host.requestUpdate();
  }
}
