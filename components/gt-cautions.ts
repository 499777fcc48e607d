import { LitElement, css, html } from 'lit';
import { customElement, state } from 'lit/decorators.js';

/**
 * The safety note, always one click away: a button that opens it in a dialog.
 */
@customElement('gt-cautions')
export class GtCautions extends LitElement {
  static override styles = css`
    :host { display: inline-block; }
    button.open { font: inherit; font-size: 0.8rem; background: transparent; color: var(--gt-accent, #ffb547); border: 1px solid rgba(255, 181, 71, 0.5); border-radius: 12px; padding: 0.15rem 0.7rem; cursor: pointer; }
    dialog { max-width: 36rem; background: #1b1f26; color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-accent, #ffb547); border-radius: 8px; padding: 1rem 1.2rem; font-size: 0.88rem; line-height: 1.45; }
    dialog::backdrop { background: rgba(0, 0, 0, 0.55); }
    h2 { font-size: 1rem; margin: 0 0 0.5rem; color: var(--gt-accent, #ffb547); }
    li { margin-bottom: 0.45rem; }
    button.close { font: inherit; background: var(--gt-panel-2, #232831); color: inherit; border: 1px solid var(--gt-line, #2c333d); border-radius: 4px; padding: 0.2rem 0.8rem; cursor: pointer; }
  `;

  @state() private open = false;

  override render() {
    return html`<button class="open" data-cautions @click=${this.show}>⚠ Safety notes</button>
      <dialog @close=${() => (this.open = false)} aria-labelledby="caution-title">
        <h2 id="caution-title">Before you build or listen</h2>
        <ul>
          <li><b>Bright LEDs can harm eyes.</b> High-power LEDs, blue and white ones especially, can injure the retina when looked into at close
            range. Do not stare into the emitter or view it through lenses; check the part's photobiological risk group (IEC 62471) and keep to
            the exposure limits it implies.</li>
          <li><b>Mains-powered builds need isolation.</b> Anything connected to the mains needs proper isolation, creepage and clearance, fusing
            and earthing; use a certified isolated supply rather than a home-made one.</li>
          <li><b>Local codes and licensed practice come first.</b> This tool simulates; it does not certify. Wiring rules, electrical safety
            regulations and the work of licensed electricians take precedence over anything shown here.</li>
          <li><b>Headphones: start quiet.</b> Simulated distortion and noise can be harsh. Turn the volume down before the first playback and
            raise it slowly. The page limits peaks, but your device's volume is yours to set.</li>
        </ul>
        <form method="dialog"><button class="close">Close</button></form>
      </dialog>`;
  }

  private show(): void {
    this.renderRoot.querySelector('dialog')?.showModal();
    this.open = true;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-cautions': GtCautions;
  }
}
