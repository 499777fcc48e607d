import { LitElement, css, html } from 'lit';
import { customElement } from 'lit/decorators.js';

/**
 * The place for headroom searches, parameter sweeps and tolerance runs. They
 * are a later issue; until then this panel says so and what will be here.
 */
@customElement('gt-margins-panel')
export class GtMarginsPanel extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.85rem; color: var(--gt-muted, #9aa3ad); max-width: 46rem; line-height: 1.5; }
    h3 { color: var(--gt-text, #e2e6ea); font-size: 0.92rem; margin: 0 0 0.4rem; }
  `;

  override render() {
    return html`<h3>Margins — not built yet</h3>
      <p>This tab is reserved for a later issue. Nothing here runs yet. It will hold:</p>
      <ul>
        <li><b>Headroom:</b> how many dB louder the talker can get before the LED cuts off or a transistor saturates.</li>
        <li><b>Sweeps:</b> one setting stepped over a range (a resistor, the distance, the ambient light) with the figures plotted against it.</li>
        <li><b>Tolerance runs:</b> part values scattered within their tolerances, many renders, and the spread of every figure.</li>
      </ul>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-margins-panel': GtMarginsPanel;
  }
}
