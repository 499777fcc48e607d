import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { formatFigure } from './support/value-text.ts';
import type { RenderedLink } from '../src/worker/messages.ts';

/** The render in plain words (the same summary the command line prints) and every figure measured. */
@customElement('gt-report-view')
export class GtReportView extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.84rem; line-height: 1.5; }
    ul { padding-left: 1.1rem; margin: 0 0 0.8rem; }
    table { border-collapse: collapse; font-variant-numeric: tabular-nums; }
    th, td { text-align: left; padding: 0.12rem 0.6rem 0.12rem 0; border-bottom: 1px solid var(--gt-line, #2c333d); }
    th { color: var(--gt-muted, #9aa3ad); font-weight: 500; }
    .note { color: var(--gt-muted, #9aa3ad); font-size: 0.78rem; }
    h3 { font-size: 0.9rem; margin: 0.4rem 0; }
  `;

  @property({ attribute: false }) run: RenderedLink | null = null;

  override render() {
    const run = this.run;
    if (!run) return nothing;
    return html`<h3>What happened</h3>
      <ul data-summary>${run.summary.map((line) => html`<li>${line}</li>`)}</ul>
      ${run.renderedSeconds < run.fullSeconds
        ? html`<p class="note">An excerpt: the first ${run.renderedSeconds.toFixed(2)} s of ${run.fullSeconds.toFixed(2)} s, at the level of the whole source.</p>`
        : nothing}
      <h3>Figures</h3>
      <table>
        <thead><tr><th>Figure</th><th>Value</th></tr></thead>
        <tbody>
          ${run.metrics.map(
            (m) => html`<tr>
              <td>${m.label}</td>
              <td>${m.value === null ? html`<span class="note">n/a${m.note ? ` — ${m.note}` : ''}</span>` : m.unit === 'V' || m.unit === 'W' || m.unit === 'A' ? formatFigure(m.value, m.unit, 4) : `${Number(m.value.toPrecision(4))} ${m.unit}`}</td>
            </tr>`,
          )}
        </tbody>
      </table>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-report-view': GtReportView;
  }
}
