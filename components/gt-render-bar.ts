import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';

export type RenderState = 'idle' | 'waiting' | 'rendering' | 'failed';

const EXCERPTS: (number | null)[] = [0.5, 1, 3, 10, 30, null];

/**
 * Render status: progress with a cancel button while the worker runs, the
 * excerpt length (the first 3 s by default, so that an edit is heard and seen
 * within about a second), and what the last render cost.
 *
 * @fires render-now
 * @fires render-cancel
 * @fires excerpt-change - number | null (null: the whole source)
 */
@customElement('gt-render-bar')
export class GtRenderBar extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.8rem; }
    .row { display: flex; flex-wrap: wrap; gap: 0.4rem 0.9rem; align-items: center; }
    progress { width: 12rem; height: 0.6rem; accent-color: var(--gt-accent, #ffb547); }
    button, select { font: inherit; background: var(--gt-panel-2, #232831); color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-line, #2c333d); border-radius: 4px; padding: 0.12rem 0.55rem; cursor: pointer; }
    .state { font-weight: 600; }
    .state.failed { color: var(--gt-bad, #ff6b6b); }
    .state.rendering, .state.waiting { color: var(--gt-accent, #ffb547); }
    .muted { color: var(--gt-muted, #9aa3ad); }
    .message { color: var(--gt-bad, #ff6b6b); margin-top: 0.25rem; }
  `;

  @property() state: RenderState = 'idle';
  @property({ type: Number }) fraction = 0;
  @property() message = '';
  @property({ attribute: false }) excerptSeconds: number | null = 3;
  /** "3.0 s of 10.2 s in 8.1 s (0.37× real time)" for the last good render. */
  @property() lastRun = '';
  @property({ type: Boolean }) stale = false;

  override render() {
    const label = { idle: this.stale ? 'settings changed' : 'up to date', waiting: 'render soon…', rendering: 'rendering', failed: 'render failed' }[this.state];
    return html`<div class="row" data-render-state=${this.state}>
        <span class="state ${this.state}">${label}</span>
        ${this.state === 'rendering'
          ? html`<progress max="1" .value=${this.fraction} aria-label="render progress"></progress>
              <span class="muted">${Math.round(this.fraction * 100)} %</span>
              <button data-cancel @click=${() => this.fire('render-cancel')}>Cancel</button>`
          : html`<button data-render @click=${() => this.fire('render-now')}>Render now</button>`}
        <label class="muted">Render
          <select data-excerpt @change=${this.onExcerpt}>
            ${EXCERPTS.map((s) => html`<option .value=${s === null ? 'all' : String(s)} ?selected=${s === this.excerptSeconds}>${s === null ? 'the whole source' : `the first ${s} s`}</option>`)}
          </select>
        </label>
        ${this.lastRun ? html`<span class="muted" data-last-run>last: ${this.lastRun}</span>` : nothing}
      </div>
      ${this.state === 'failed' && this.message ? html`<div class="message" role="alert" data-render-error>${this.message} — the last good render stays on screen.</div>` : nothing}`;
  }

  private onExcerpt(event: Event): void {
    const value = (event.target as HTMLSelectElement).value;
    this.fire('excerpt-change', value === 'all' ? null : Number(value));
  }

  private fire(type: string, detail?: unknown): void {
    this.dispatchEvent(new CustomEvent(type, { detail, bubbles: true, composed: true }));
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-render-bar': GtRenderBar;
  }
}
