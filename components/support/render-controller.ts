/**
 * Renders for an element, as a Lit reactive controller: debounced start after
 * a change, one render at a time in the worker (a new one cancels the
 * running one), progress, the bias as soon as the worker has it, and the last
 * good render kept when a later one fails or is cancelled.
 */
import type { ReactiveController, ReactiveControllerHost } from 'lit';
import type { BiasTables, RenderRequest, RenderedLink } from '../../src/worker/messages.ts';
import type { RenderState } from '../gt-render-bar.ts';
import { withoutLabel } from './apply-edit.ts';
import { RenderClient, RenderFailure } from './render-client.ts';
import type { JsonObject, ScenarioDoc } from './scenario-doc.ts';

/** Quiet time after an edit before the link re-renders by itself. */
export const RENDER_DEBOUNCE_MS = 600;

/** What to render now, or why it cannot be rendered. */
export type Prepared = { doc: ScenarioDoc; request: Omit<RenderRequest, 'kind' | 'id' | 'excerptSeconds'> } | { problem: string } | null;

export class RenderController implements ReactiveController {
  state: RenderState = 'idle';
  progress = 0;
  message = '';
  /** The last good render and the document it was made from (identity tells whether it is stale). */
  run: RenderedLink | null = null;
  runJson: JsonObject | null = null;
  bias: BiasTables | null = null;
  biasJson: JsonObject | null = null;
  /** Render only the first this many seconds; null for the whole source. */
  excerptSeconds: number | null = 3;

  private readonly client = new RenderClient();
  private timer = 0;
  private renders = 0;
  private biasSolves = 0;

  constructor(
    private readonly host: ReactiveControllerHost & HTMLElement,
    private readonly prepare: () => Promise<Prepared>,
  ) {
    host.addController(this);
  }

  hostDisconnected(): void {
    clearTimeout(this.timer);
    this.client.dispose();
  }

  schedule(delayMs = RENDER_DEBOUNCE_MS): void {
    clearTimeout(this.timer);
    this.set({ state: this.client.busy ? 'rendering' : 'waiting' });
    this.timer = window.setTimeout(() => void this.start(), delayMs);
  }

  cancel(): void {
    clearTimeout(this.timer);
    this.client.cancel();
    this.set({ state: 'idle' });
  }

  private async start(): Promise<void> {
    const prepared = await this.prepare();
    if (prepared === null) return;
    if ('problem' in prepared) {
      this.set({ state: 'failed', message: prepared.problem });
      return;
    }
    const { doc, request } = prepared;
    this.set({ state: 'rendering', progress: 0, message: '' });
    try {
      const result = await this.client.render(
        { ...request, excerptSeconds: this.excerptSeconds },
        {
          onBias: (bias) => {
            this.set({ bias, biasJson: doc.json });
            // Counters for scripts and tests that wait on the page.
            this.host.dataset.biasSolves = String(++this.biasSolves);
          },
          onProgress: (progress) => this.set({ progress }),
        },
      );
      this.set({ run: result, runJson: doc.json, state: 'idle' });
      this.host.dataset.renders = String(++this.renders);
    } catch (error) {
      if (error instanceof RenderFailure && error.cancelled) return;
      this.set({ state: 'failed', message: withoutLabel((error as Error).message, doc.label) });
    }
  }

  private set(changes: Partial<Pick<RenderController, 'state' | 'progress' | 'message' | 'run' | 'runJson' | 'bias' | 'biasJson'>>): void {
    Object.assign(this, changes);
    this.host.requestUpdate();
  }
}
