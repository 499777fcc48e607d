import { LitElement, css, html, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { formatFigure } from './support/value-text.ts';
import type { LinkMetric } from '../src/worker/messages.ts';
import { settingDifferences, type JsonObject } from './support/scenario-doc.ts';
import type { Snapshot, SnapshotMeta } from './support/workbench-store.ts';

export interface CurrentRender {
  json: JsonObject;
  metrics: LinkMetric[];
  renderedSeconds: number;
}

function showMetric(m: LinkMetric | undefined): string {
  if (!m) return '—';
  if (m.value === null) return m.note ? `n/a (${m.note})` : 'n/a';
  if (m.unit === 'V' || m.unit === 'W' || m.unit === 'A') return formatFigure(m.value, m.unit, 4);
  return `${Number(m.value.toPrecision(4))}${m.unit ? ` ${m.unit}` : ''}`;
}

/**
 * Variants side by side: keep the current render as a named snapshot (kept
 * in IndexedDB), pick one to compare, and see which settings differ and how
 * every figure moved. Listening A/B is in the player bar.
 *
 * @fires snapshot-keep - { name: string }
 * @fires snapshot-compare - { id: string | null }
 * @fires snapshot-delete - { id: string }
 */
@customElement('gt-compare-panel')
export class GtComparePanel extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.82rem; }
    h3 { font-size: 0.88rem; margin: 0.8rem 0 0.35rem; font-weight: 600; }
    .row { display: flex; gap: 0.5rem; align-items: center; flex-wrap: wrap; }
    input { font: inherit; background: var(--gt-input, #10141a); color: inherit; border: 1px solid var(--gt-line, #2c333d); border-radius: 3px; padding: 0.15rem 0.4rem; width: 14rem; }
    button { font: inherit; background: var(--gt-panel-2, #232831); color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-line, #2c333d); border-radius: 4px; padding: 0.15rem 0.55rem; cursor: pointer; }
    button:disabled { opacity: 0.45; cursor: default; }
    button[aria-pressed='true'] { border-color: var(--gt-accent, #ffb547); }
    table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; }
    th, td { text-align: left; padding: 0.15rem 0.4rem; border-bottom: 1px solid var(--gt-line, #2c333d); vertical-align: top; }
    th { color: var(--gt-muted, #9aa3ad); font-weight: 500; }
    tr.moved td { color: var(--gt-text, #e2e6ea); }
    tr.same td { color: var(--gt-muted, #9aa3ad); }
    td.path { font-family: ui-monospace, monospace; font-size: 0.76rem; }
    .note { color: var(--gt-muted, #9aa3ad); font-size: 0.76rem; }
    ul { list-style: none; padding: 0; margin: 0; display: grid; gap: 0.25rem; }
    li { display: flex; gap: 0.5rem; align-items: center; }
    li .name { min-width: 10rem; font-weight: 600; }
  `;

  @property({ attribute: false }) snapshots: SnapshotMeta[] = [];
  @property({ attribute: false }) current: CurrentRender | null = null;
  @property({ attribute: false }) compared: Snapshot | null = null;

  @state() private name = '';

  override render() {
    const suggested = `variant ${this.snapshots.length + 1}`;
    return html`
      <div class="row">
        <input data-snapshot-name placeholder=${suggested} .value=${this.name} @input=${(e: Event) => (this.name = (e.target as HTMLInputElement).value)} />
        <button data-keep ?disabled=${!this.current} @click=${() => this.keep(suggested)}>Keep current render</button>
        <span class="note">Kept in this browser (IndexedDB) with its settings, far end and figures.</span>
      </div>
      <h3>Kept snapshots</h3>
      ${this.snapshots.length === 0 ? html`<p class="note">None yet.</p>` : nothing}
      <ul>
        ${this.snapshots.map(
          (s) => html`<li data-snapshot=${s.name}>
            <span class="name">${s.name}</span>
            <span class="note">${new Date(s.createdIso).toLocaleString()} · ${s.label} · ${s.renderedSeconds.toFixed(1)} s</span>
            <button aria-pressed=${this.compared?.id === s.id ? 'true' : 'false'} data-compare @click=${() => this.fire('snapshot-compare', { id: this.compared?.id === s.id ? null : s.id })}>
              ${this.compared?.id === s.id ? 'Comparing' : 'Compare'}
            </button>
            <button data-delete @click=${() => this.fire('snapshot-delete', { id: s.id })}>Delete</button>
          </li>`,
        )}
      </ul>
      ${this.compared && this.current ? this.renderComparison(this.compared, this.current) : nothing}
    `;
  }

  private renderComparison(snapshot: Snapshot, current: CurrentRender) {
    const differences = settingDifferences(snapshot.json, current.json);
    const keys = [...new Set([...snapshot.metrics.map((m) => m.key), ...current.metrics.map((m) => m.key)])];
    return html`
      <h3>Settings that differ (B = “${snapshot.name}”, A = current)</h3>
      ${differences.length === 0
        ? html`<p class="note" data-no-differences>None: the same settings.</p>`
        : html`<table data-differences>
            <thead><tr><th>Setting</th><th>B: ${snapshot.name}</th><th>A: current</th></tr></thead>
            <tbody>${differences.map((d) => html`<tr class="moved"><td class="path">${d.path}</td><td>${d.before ?? '(not set)'}</td><td>${d.after ?? '(not set)'}</td></tr>`)}</tbody>
          </table>`}
      ${snapshot.renderedSeconds !== current.renderedSeconds
        ? html`<p class="note">The renders cover different lengths (${snapshot.renderedSeconds.toFixed(2)} s and ${current.renderedSeconds.toFixed(2)} s); figures are over each one's own length.</p>`
        : nothing}
      <h3>Figures</h3>
      <table data-metrics>
        <thead><tr><th>Figure</th><th>B: ${snapshot.name}</th><th>A: current</th></tr></thead>
        <tbody>
          ${keys.map((key) => {
            const b = snapshot.metrics.find((m) => m.key === key);
            const a = current.metrics.find((m) => m.key === key);
            const moved = showMetric(a) !== showMetric(b);
            return html`<tr class=${moved ? 'moved' : 'same'}><td>${(a ?? b)!.label}</td><td>${showMetric(b)}</td><td>${showMetric(a)}</td></tr>`;
          })}
        </tbody>
      </table>
      <p class="note">Listen: the A/B button in the player switches between the two far ends at the same position, level-matched.</p>
    `;
  }

  private keep(suggested: string): void {
    this.fire('snapshot-keep', { name: this.name.trim() || suggested });
    this.name = '';
  }

  private fire(type: string, detail: unknown): void {
    this.dispatchEvent(new CustomEvent(type, { detail, bubbles: true, composed: true }));
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-compare-panel': GtComparePanel;
  }
}
