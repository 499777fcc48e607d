import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { readEngineering } from '../src/units/engineering.ts';
import type { Json, JsonObject } from './support/scenario-doc.ts';
import type { FieldEditDetail } from './gt-value-field.ts';
import { readTyped, shownValue } from './support/value-text.ts';

const VALUE_UNITS: Record<string, string> = { resistor: 'Ω', capacitor: 'F', inductor: 'H', 'voltage-source': 'V', 'current-source': 'A' };
const PARAMETER_UNITS: Record<string, string> = {
  saturationCurrent: 'A',
  seriesResistance: 'Ω',
  collectorResistance: 'Ω',
  junctionCapacitance: 'F',
  baseEmitterCapacitance: 'F',
  baseCollectorCapacitance: 'F',
  wavelength: 'm',
  earlyVoltage: 'V',
  responsivity: 'A/W',
};

const isObject = (value: unknown): value is JsonObject => typeof value === 'object' && value !== null && !Array.isArray(value);

/**
 * The parts of one circuit with their values editable in engineering
 * notation (R, C, L values and source DC levels), and the circuit's own
 * models with their parameters. Each cell checks what is typed; the parent
 * checks the whole scenario and returns the reason in `errors`.
 *
 * @fires field-edit - FieldEditDetail with a path like transmitter.circuit.parts[R3].value
 */
@customElement('gt-parts-table')
export class GtPartsTable extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.8rem; }
    h3 { font-size: 0.85rem; margin: 0.6rem 0 0.3rem; font-weight: 600; }
    table { border-collapse: collapse; width: 100%; font-variant-numeric: tabular-nums; }
    th, td { text-align: left; padding: 0.12rem 0.35rem; border-bottom: 1px solid var(--gt-line, #2c333d); vertical-align: top; }
    th { color: var(--gt-muted, #9aa3ad); font-weight: 500; }
    td.pins { color: var(--gt-muted, #9aa3ad); font-size: 0.75rem; }
    input { font: inherit; width: 6.5rem; background: var(--gt-input, #10141a); color: inherit; border: 1px solid var(--gt-line, #2c333d); border-radius: 3px; padding: 0.05rem 0.3rem; }
    input[aria-invalid='true'] { border-color: var(--gt-bad, #ff6b6b); background: #2a1416; }
    .error { color: var(--gt-bad, #ff6b6b); font-size: 0.75rem; display: block; max-width: 22rem; }
    .model { color: var(--gt-cyan, #58c4dc); }
    .title { color: var(--gt-muted, #9aa3ad); font-size: 0.76rem; margin: -0.1rem 0 0.35rem; }
  `;

  @property() block: 'transmitter' | 'receiver' = 'transmitter';
  @property({ attribute: false }) circuit: Json | undefined = undefined;
  @property({ attribute: false }) errors: Record<string, string> = {};

  private drafts = new Map<string, { text: string; reason: string }>();

  override willUpdate(changed: Map<string, unknown>): void {
    // A fresh circuit from outside drops drafts that are no longer wrong.
    if (changed.has('circuit') || changed.has('errors')) {
      for (const [path, draft] of this.drafts) if (!draft.reason && !this.errors[path]) this.drafts.delete(path);
    }
  }

  override render() {
    const circuit = this.circuit;
    if (!isObject(circuit) || !Array.isArray(circuit.parts)) return html`<p>No circuit.</p>`;
    const parts = circuit.parts.filter(isObject);
    const models = isObject(circuit.models) ? Object.entries(circuit.models).filter(([, m]) => isObject(m)) : [];
    return html`
      <h3>Parts</h3>
      ${typeof circuit.title === 'string' ? html`<p class="title">${circuit.title}</p>` : nothing}
      <table data-parts=${this.block}>
        <thead><tr><th>Ref</th><th>Kind</th><th>Pins</th><th>Value</th></tr></thead>
        <tbody>${parts.map((part) => this.partRow(part))}</tbody>
      </table>
      ${models.length > 0
        ? html`<h3>Models of this circuit</h3>
            <table>
              <thead><tr><th>Model</th><th>Parameter</th><th>Value</th></tr></thead>
              <tbody>
                ${models.flatMap(([name, model]) =>
                  Object.entries(model as JsonObject)
                    .filter(([key]) => key !== 'kind')
                    .map(
                      ([key, value], i) => html`<tr>
                        <td class="model">${i === 0 ? `${name} (${String((model as JsonObject).kind)})` : ''}</td>
                        <td>${key}</td>
                        <td>${this.valueCell(`${this.block}.circuit.models[${name}].${key}`, value, PARAMETER_UNITS[key] ?? '')}</td>
                      </tr>`,
                    ),
                )}
              </tbody>
            </table>`
        : nothing}
    `;
  }

  private partRow(part: JsonObject) {
    const ref = String(part.ref);
    const kind = String(part.kind);
    const pins = Array.isArray(part.pins) ? part.pins.join(' · ') : '';
    let cell: unknown = '';
    if (kind in VALUE_UNITS) {
      const key = kind.endsWith('source') ? 'dc' : 'value';
      const wave = isObject(part.wave) ? ` + ${String(part.wave.shape)} wave` : '';
      cell =
        part[key] !== undefined
          ? html`${this.valueCell(`${this.block}.circuit.parts[${ref}].${key}`, part[key], VALUE_UNITS[kind])}${wave ? html`<span class="pins">${wave}</span>` : nothing}`
          : html`<span class="pins">${wave.replace(' + ', '') || '0'}</span>`;
    } else if (typeof part.model === 'string') {
      cell = html`<span class="model">${part.model}</span>`;
    }
    return html`<tr data-ref=${ref}><td>${ref}</td><td>${kind}</td><td class="pins">${pins}</td><td>${cell}</td></tr>`;
  }

  private valueCell(path: string, value: Json, unit: string) {
    const draft = this.drafts.get(path);
    const read = typeof value === 'string' || typeof value === 'number' ? readEngineering(value) : null;
    const reason = draft?.reason || this.errors[path] || '';
    if (!read?.ok) return html`<span class="pins">${JSON.stringify(value)}</span>`;
    return html`<input
        data-path=${path}
        aria-label=${path}
        .value=${draft?.text ?? shownValue(value, true, unit)}
        aria-invalid=${reason ? 'true' : 'false'}
        spellcheck="false"
        @input=${(e: Event) => this.onInput(path, unit, (e.target as HTMLInputElement).value)}
      />
      <span class="pins">${unit}</span>
      ${reason ? html`<span class="error" role="alert" data-field-error=${path}>${reason}</span>` : nothing}`;
  }

  private onInput(path: string, unit: string, text: string): void {
    const read = readTyped(text, unit, true);
    this.drafts.set(path, { text, reason: read.ok ? '' : read.reason });
    this.requestUpdate();
    if (read.ok) {
      this.dispatchEvent(new CustomEvent<FieldEditDetail>('field-edit', { detail: { path, value: read.value }, bubbles: true, composed: true }));
    }
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-parts-table': GtPartsTable;
  }
}
