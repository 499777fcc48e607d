import { LitElement, css, html, nothing } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import { FIELDS, fieldValue, type BlockId } from './support/field-catalogue.ts';
import type { JsonObject } from './support/scenario-doc.ts';
import './gt-value-field.ts';

const TITLES: Record<BlockId, string> = {
  voice: 'Voice (source)',
  microphone: 'Microphone',
  transmitter: 'Transmitter',
  light: 'Light path',
  receiver: 'Receiver',
  speaker: 'Speaker and far-end file',
  solver: 'Solver',
};

/**
 * The settings of one block of the chain, as fields. Edits bubble up as
 * `field-edit` events from the fields; `errors` (path → reason) come back
 * from the parent's check of the whole scenario. Extra content (parts, bias
 * tables) goes in the default slot.
 */
@customElement('gt-block-settings')
export class GtBlockSettings extends LitElement {
  static override styles = css`
    :host { display: block; }
    h2 { font-size: 0.95rem; margin: 0 0 0.5rem; color: var(--gt-text, #e2e6ea); font-weight: 600; letter-spacing: 0.02em; }
    .fields { display: grid; gap: 0.3rem; margin-bottom: 0.8rem; }
    .empty { color: var(--gt-muted, #9aa3ad); font-size: 0.8rem; }
  `;

  @property() block: BlockId = 'voice';
  @property({ attribute: false }) json: JsonObject | null = null;
  @property({ attribute: false }) errors: Record<string, string> = {};
  /** Extra choices for fields whose options come from the page (e.g. the recording's name). */
  @property({ attribute: false }) extraChoices: Record<string, readonly string[]> = {};

  override render() {
    const json = this.json;
    if (!json) return html`<p class="empty">No scenario loaded.</p>`;
    const fields = FIELDS[this.block].filter((f) => !f.when || f.when(json));
    return html`
      <h2>${TITLES[this.block]}</h2>
      <div class="fields">
        ${fields.map(
          (f) => html`<gt-value-field
            .path=${f.path}
            .label=${f.label}
            .unit=${f.unit}
            .kind=${f.kind}
            .engineering=${f.engineering ?? false}
            .choices=${this.extraChoices[f.path] ?? f.choicesFrom?.(json) ?? f.choices ?? []}
            .value=${fieldValue(json, f)}
            .nullable=${f.nullable ?? null}
            .hint=${f.hint ?? ''}
            .error=${this.errors[f.path] ?? ''}
          ></gt-value-field>`,
        )}
        ${fields.length === 0 ? html`<p class="empty">No settings of its own.</p>` : nothing}
      </div>
      <slot></slot>
    `;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-block-settings': GtBlockSettings;
  }
}
