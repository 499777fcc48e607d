import { LitElement, css, html, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { Json } from './support/scenario-doc.ts';
import { readTyped, shownValue } from './support/value-text.ts';

export interface FieldEditDetail {
  path: string;
  /** The new value, or null for "switched off" on a nullable field. */
  value: Json;
}

/**
 * One setting: a number (with unit and engineering notation), a choice, or an
 * on/off for a setting that may be null. Checks the text as it is typed; the
 * parent checks the value against the whole scenario and hands back `error`.
 *
 * @fires field-edit - FieldEditDetail, on every acceptable edit
 */
@customElement('gt-value-field')
export class GtValueField extends LitElement {
  static override styles = css`
    :host { display: grid; grid-template-columns: minmax(9rem, 1fr) minmax(7rem, 9rem) 3.2rem; gap: 0.2rem 0.5rem; align-items: center; font-size: 0.85rem; }
    label { color: var(--gt-muted, #9aa3ad); }
    input, select { font: inherit; font-variant-numeric: tabular-nums; background: var(--gt-input, #10141a); color: inherit; border: 1px solid var(--gt-line, #2c333d); border-radius: 3px; padding: 0.15rem 0.35rem; width: 100%; box-sizing: border-box; }
    input:focus, select:focus { outline: 1px solid var(--gt-accent, #ffb547); }
    input[aria-invalid='true'] { border-color: var(--gt-bad, #ff6b6b); background: #2a1416; }
    .unit { color: var(--gt-muted, #9aa3ad); font-size: 0.8rem; }
    .error { grid-column: 1 / -1; color: var(--gt-bad, #ff6b6b); font-size: 0.78rem; margin: 0 0 0.2rem; }
    .hint { grid-column: 1 / -1; color: var(--gt-muted, #9aa3ad); font-size: 0.72rem; margin: -0.1rem 0 0.2rem; }
    .off { display: flex; gap: 0.3rem; align-items: center; }
    .off input { width: auto; }
    .valuebox { display: flex; gap: 0.3rem; align-items: center; }
  `;

  @property() path = '';
  @property() label = '';
  @property() unit = '';
  @property() kind: 'number' | 'choice' | 'toggle' = 'number';
  @property({ type: Boolean }) engineering = false;
  @property({ attribute: false }) choices: readonly (string | number | boolean)[] = [];
  @property({ attribute: false }) value: Json | undefined = undefined;
  @property({ attribute: false }) nullable: { offLabel: string; onValue: Json } | null = null;
  @property() hint = '';
  /** The whole-scenario check's reason, from the parent. */
  @property() error = '';
  @property({ type: Boolean }) readonly = false;

  /** What is typed, kept while it is not (yet) a good value. */
  @state() private draft: string | null = null;
  @state() private localError = '';

  override willUpdate(changed: Map<string, unknown>): void {
    // A new value from outside (load, undo) replaces the draft unless it is being fixed.
    if (changed.has('value') && !this.localError && !this.error && !this.matches(':focus-within')) this.draft = null;
  }

  override render() {
    const id = `f-${this.path}`;
    const message = this.localError || this.error;
    const isOff = this.nullable !== null && this.value === null;
    return html`
      <label for=${id}>${this.label}</label>
      ${this.kind === 'choice' ? this.renderChoice(id) : this.kind === 'toggle' ? this.renderToggle(id) : this.renderNumber(id, isOff, message)}
      <span class="unit">${this.unit}</span>
      ${message ? html`<p class="error" role="alert" data-field-error=${this.path}>${message}</p>` : nothing}
      ${this.hint && !message ? html`<p class="hint">${this.hint}</p>` : nothing}
    `;
  }

  private renderNumber(id: string, isOff: boolean, message: string) {
    const text = this.draft ?? shownValue(this.value, this.engineering, this.unit);
    return html`<span class="valuebox">
      ${isOff
        ? html`<span class="unit">${this.nullable!.offLabel}</span>`
        : html`<input
            id=${id}
            data-path=${this.path}
            .value=${text}
            ?readonly=${this.readonly}
            aria-invalid=${message ? 'true' : 'false'}
            spellcheck="false"
            autocomplete="off"
            @input=${this.onInput}
            @blur=${this.onBlur}
          />`}
      ${this.nullable
        ? html`<label class="off" title="switch off (${this.nullable.offLabel})"
            ><input type="checkbox" .checked=${!isOff} @change=${this.onToggle} aria-label="${this.label} on"
          /></label>`
        : nothing}
    </span>`;
  }

  private renderChoice(id: string) {
    const current = this.value === undefined || this.value === null ? '' : String(this.value);
    const options = this.choices.length > 0 ? this.choices : [current];
    return html`<select id=${id} data-path=${this.path} ?disabled=${this.readonly || this.choices.length === 0} @change=${this.onChoice}>
      ${options.map((c) => html`<option .value=${String(c)} ?selected=${String(c) === current}>${String(c)}</option>`)}
    </select>`;
  }

  private renderToggle(id: string) {
    const on = this.value !== null && this.value !== undefined;
    return html`<label class="off"><input id=${id} data-path=${this.path} type="checkbox" .checked=${on} @change=${this.onToggle} />
      ${on ? 'on' : this.nullable?.offLabel ?? 'off'}</label>`;
  }

  private onInput(event: Event): void {
    const text = (event.target as HTMLInputElement).value;
    this.draft = text;
    const read = readTyped(text, this.unit, this.engineering);
    if (!read.ok) {
      this.localError = read.reason;
      return;
    }
    this.localError = '';
    this.emit(read.value);
  }

  private onBlur(): void {
    // Leaving a good value shows it in engineering notation again.
    if (!this.localError && !this.error) this.draft = null;
  }

  private onChoice(event: Event): void {
    const text = (event.target as HTMLSelectElement).value;
    const match = this.choices.find((c) => String(c) === text);
    this.emit(match === undefined ? text : match);
  }

  private onToggle(event: Event): void {
    const on = (event.target as HTMLInputElement).checked;
    this.draft = null;
    this.localError = '';
    this.emit(on ? this.nullable!.onValue : null);
  }

  private emit(value: Json): void {
    this.dispatchEvent(new CustomEvent<FieldEditDetail>('field-edit', { detail: { path: this.path, value }, bubbles: true, composed: true }));
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-value-field': GtValueField;
  }
}
