import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { BiasReport } from '../src/solver/bias-report.ts';
import { formatFigure } from './support/value-text.ts';

/**
 * The DC operating point of one circuit as the chain starts it: node
 * voltages, and for each part its voltage and current, or for a transistor
 * its pin currents and region (saturation and cut-off stand out).
 */
@customElement('gt-bias-table')
export class GtBiasTable extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.8rem; }
    h3 { font-size: 0.85rem; margin: 0.6rem 0 0.3rem; font-weight: 600; }
    .cols { display: grid; gap: 0.5rem; }
    .nodes { display: flex; flex-wrap: wrap; gap: 0.2rem 0.4rem; }
    .node { background: var(--gt-input, #10141a); border: 1px solid var(--gt-line, #2c333d); border-radius: 3px; padding: 0.05rem 0.35rem; font-variant-numeric: tabular-nums; white-space: nowrap; }
    .node span { color: var(--gt-muted, #9aa3ad); margin-right: 0.3rem; }
    table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; }
    th, td { text-align: left; padding: 0.1rem 0.35rem; border-bottom: 1px solid var(--gt-line, #2c333d); }
    th { color: var(--gt-muted, #9aa3ad); font-weight: 500; }
    td.num { text-align: right; white-space: nowrap; }
    .added { color: var(--gt-muted, #9aa3ad); font-style: italic; }
    .region-saturation, .region-cutoff, .region-reverse { color: var(--gt-warn, #ffb547); font-weight: 600; }
    .region-active { color: var(--gt-good, #7bd88f); }
    .note { color: var(--gt-muted, #9aa3ad); font-size: 0.75rem; }
  `;

  @property() heading = 'Bias point';
  @property({ attribute: false }) bias: BiasReport | null = null;
  @property({ attribute: false }) addedParts: string[] = [];
  /** Shown when the table is from an older version of the settings. */
  @property({ type: Boolean }) stale = false;

  override render() {
    const bias = this.bias;
    if (!bias) return html`<h3>${this.heading}</h3><p class="note">Computed when the scenario renders.</p>`;
    const fmt = (v: number, unit: string) => formatFigure(v, unit, 4);
    return html`
      <h3>${this.heading} ${this.stale ? html`<span class="note">(previous settings)</span>` : nothing}</h3>
      <div class="cols" data-bias=${this.heading}>
        <div class="nodes" aria-label="node voltages">
          ${Object.entries(bias.nodes).map(([name, volts]) => html`<span class="node" data-node=${name}><span>${name}</span> ${fmt(volts, 'V')}</span>`)}
        </div>
        <table>
          <thead><tr><th>Part</th><th class="num">Voltage</th><th class="num">Current</th></tr></thead>
          <tbody>
            ${Object.entries(bias.parts).map(([ref, p]) => {
              const added = this.addedParts.includes(ref);
              if ('currents' in p) {
                return html`<tr data-ref=${ref}>
                  <td>${ref}</td>
                  <td class="num region-${p.region}">${p.region}</td>
                  <td class="num">I<sub>C</sub> ${fmt(p.currents.collector, 'A')} · I<sub>B</sub> ${fmt(p.currents.base, 'A')}</td>
                </tr>`;
              }
              return html`<tr data-ref=${ref} class=${added ? 'added' : ''} title=${added ? 'added by the chain' : ''}>
                <td>${ref}${added ? ' (chain)' : ''}</td>
                <td class="num">${fmt(p.voltage, 'V')}</td>
                <td class="num">${fmt(p.current, 'A')}</td>
              </tr>`;
            })}
          </tbody>
        </table>
      </div>
      <p class="note">Solved by ${bias.method}. Currents flow into the first pin.</p>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-bias-table': GtBiasTable;
  }
}
