import { LitElement, css, html } from 'lit';
import { customElement, property } from 'lit/decorators.js';

export interface Choice {
  id: string;
  label: string;
}

/**
 * Files in and out: bundled demos, scenario files (open several at once to
 * bring the circuit files a scenario names), a WAV as the source (or drop
 * one anywhere on the page), and WAV export of the far end or any tap.
 *
 * @fires demo-load - string (demo id)
 * @fires scenario-files - File[]
 * @fires scenario-save
 * @fires wav-import - File
 * @fires wav-export - string (signal id)
 */
@customElement('gt-file-bar')
export class GtFileBar extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.8rem; }
    .row { display: flex; flex-wrap: wrap; gap: 0.35rem 0.7rem; align-items: center; }
    .group { display: inline-flex; gap: 0.3rem; align-items: center; padding-right: 0.7rem; border-right: 1px solid var(--gt-line, #2c333d); }
    .group:last-child { border-right: none; }
    button, select, .pick { font: inherit; background: var(--gt-panel-2, #232831); color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-line, #2c333d); border-radius: 4px; padding: 0.12rem 0.55rem; cursor: pointer; }
    select { max-width: 16rem; }
    input[type='file'] { display: none; }
    .muted { color: var(--gt-muted, #9aa3ad); }
  `;

  @property({ attribute: false }) demos: Choice[] = [];
  @property({ attribute: false }) exportable: Choice[] = [];
  @property() currentDemo = '';

  override render() {
    return html`<div class="row">
      <span class="group">
        <span class="muted">Demo</span>
        <select data-demo @change=${(e: Event) => this.fire('demo-load', (e.target as HTMLSelectElement).value)}>
          <option value="" ?selected=${this.currentDemo === ''} disabled>choose…</option>
          ${this.demos.map((d) => html`<option .value=${d.id} ?selected=${d.id === this.currentDemo}>${d.label}</option>`)}
        </select>
      </span>
      <span class="group">
        <span class="muted">Scenario</span>
        <label class="pick">Open…<input type="file" data-open-scenario accept=".json,application/json" multiple @change=${this.onScenarioFiles} /></label>
        <button data-save-scenario @click=${() => this.fire('scenario-save')}>Save</button>
      </span>
      <span class="group">
        <span class="muted">Source</span>
        <label class="pick">Import WAV…<input type="file" data-import-wav accept=".wav,audio/wav,audio/x-wav" @change=${this.onWav} /></label>
        <span class="muted">or drop a WAV on the page</span>
      </span>
      <span class="group">
        <span class="muted">Export</span>
        <select data-export-choice>
          ${this.exportable.map((c) => html`<option .value=${c.id}>${c.label}</option>`)}
        </select>
        <button data-export ?disabled=${this.exportable.length === 0} @click=${this.onExport}>WAV</button>
      </span>
    </div>`;
  }

  private onScenarioFiles(event: Event): void {
    const input = event.target as HTMLInputElement;
    const files = [...(input.files ?? [])];
    input.value = '';
    if (files.length > 0) this.fire('scenario-files', files);
  }

  private onWav(event: Event): void {
    const input = event.target as HTMLInputElement;
    const file = input.files?.[0];
    input.value = '';
    if (file) this.fire('wav-import', file);
  }

  private onExport(): void {
    const select = this.renderRoot.querySelector<HTMLSelectElement>('[data-export-choice]');
    if (select?.value) this.fire('wav-export', select.value);
  }

  private fire(type: string, detail?: unknown): void {
    this.dispatchEvent(new CustomEvent(type, { detail, bubbles: true, composed: true }));
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-file-bar': GtFileBar;
  }
}
