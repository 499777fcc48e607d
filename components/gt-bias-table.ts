import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { BiasReport } from '../src/solver/bias-report.ts';
import { formatEngineering } from '../src/units/engineering.ts';

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
    .cols { display: grid; grid-template-columns: minmax(8rem, 1fr) minmax(14rem, 2fr); gap: 0.8rem; }
    table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; }
    th, td { text-align: left; padding: 0.1rem 0.35rem; border-bottom: 1px solid var(--gt-line, #2c333d); }
    th { color: var(--gt-muted, #9aa3ad); font-weight: 500; }
    td.num { text-align: right; white-space: nowrap; }
    .added { color: var(--gt-muted, #9aa3ad); font-style: italic; }
    .region-saturation, .region-cutoff, .region-reverse { color: var(--gt-warn, #ffb547); font-weight: 600; }
    .region-active { color: var(--gt-good, #7bd88f); }
    .note { color: var(--gt-muted, #9aa3ad); font-size: 0.75rem; }
    @media (max-width: 900px) { .cols { grid-template-columns: 1fr; } }
  `;

  @property() heading = 'Bias point';
  @property({ attribute: false }) bias: BiasReport | null = null;
  @property({ attribute: false }) addedParts: string[] = [];
  /** Shown when the table is from an older version of the settings. */
  @property({ type: Boolean }) stale = false;

  override render() {
    const bias = this.bias;
    if (!bias) return html`<h3>${this.heading}</h3><p class="note">Computed when the scenario renders.</p>`;
    const fmt = (v: number, unit: string) => formatEngineering(v, unit, 4);
    return html`
      <h3>${this.heading} ${this.stale ? html`<span class="note">(previous settings)</span>` : nothing}</h3>
      <div class="cols" data-bias=${this.heading}>
        <table>
          <thead><tr><th>Node</th><th class="num">Voltage</th></tr></thead>
          <tbody>
            ${Object.entries(bias.nodes).map(([name, volts]) => html`<tr><td>${name}</td><td class="num">${fmt(volts, 'V')}</td></tr>`)}
          </tbody>
        </table>
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
