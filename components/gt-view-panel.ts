import { LitElement, css, html, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import type { RecordingData, RenderedLink } from '../src/worker/messages.ts';
import type { RenderState } from './gt-render-bar.ts';
import { shadingOf, tracesOf } from './support/run-views.ts';
import type { JsonObject } from './support/scenario-doc.ts';
import { TRACE_COLOURS } from './support/plot-theme.ts';
import type { Snapshot, SnapshotMeta } from './support/workbench-store.ts';
import './gt-compare-panel.ts';
import './gt-margins-panel.ts';
import './gt-report-view.ts';
import './gt-spectrum-view.ts';
import './gt-trace-stack.ts';
import './gt-transfer-view.ts';

type ViewId = 'traces' | 'spectrum' | 'transfer' | 'report' | 'compare' | 'margins';
const VIEWS: [ViewId, string][] = [
  ['traces', 'Traces'],
  ['spectrum', 'Spectrum'],
  ['transfer', 'Transfer'],
  ['report', 'Report'],
  ['compare', 'Compare'],
  ['margins', 'Margins'],
];

/**
 * The views of a render in tabs: traces, spectrum, transfer, report, the
 * comparison with kept snapshots, and the margins (kept alive while hidden, so
 * a running analysis and its results survive a change of tab). Events of the
 * views (range-select, snapshot-keep/compare/delete) bubble through.
 */
@customElement('gt-view-panel')
export class GtViewPanel extends LitElement {
  static override styles = css`
    :host { display: block; }
    nav { display: flex; gap: 0.2rem; border-bottom: 1px solid var(--gt-line, #2c333d); margin-bottom: 0.5rem; align-items: flex-end; }
    nav button { font: inherit; font-size: 0.82rem; background: none; color: var(--gt-muted, #9aa3ad); border: none; border-bottom: 2px solid transparent; padding: 0.25rem 0.7rem; cursor: pointer; }
    nav button[aria-selected='true'] { color: var(--gt-text, #e2e6ea); border-bottom-color: var(--gt-accent, #ffb547); }
    .stale-note { margin-left: auto; font-size: 0.75rem; color: var(--gt-accent, #ffb547); padding-bottom: 0.3rem; }
    gt-margins-panel[hidden] { display: none; }
    .empty { color: var(--gt-muted, #9aa3ad); font-size: 0.85rem; }
  `;

  @property({ attribute: false }) run: RenderedLink | null = null;
  /** The document the render was made from. */
  @property({ attribute: false }) runJson: JsonObject | null = null;
  @property({ type: Boolean }) stale = false;
  @property() renderState: RenderState = 'idle';
  @property({ attribute: false }) playheadSeconds: number | null = null;
  @property({ attribute: false }) snapshots: SnapshotMeta[] = [];
  @property({ attribute: false }) compared: Snapshot | null = null;
  /** The document being edited, its label and the recording it names, for the Margins tab. */
  @property({ attribute: false }) docJson: JsonObject | null = null;
  @property() docLabel = 'scenario';
  @property({ attribute: false }) recording: RecordingData | null = null;

  @state() private view: ViewId = 'traces';

  override render() {
    return html`<nav role="tablist">
        ${VIEWS.map(([id, label]) => html`<button role="tab" data-view=${id} aria-selected=${this.view === id ? 'true' : 'false'} @click=${() => (this.view = id)}>${label}</button>`)}
        ${this.stale ? html`<span class="stale-note">showing the render of earlier settings</span>` : nothing}
      </nav>
      <div class="view">${this.view === 'margins' ? nothing : this.renderView()}</div>
      <gt-margins-panel ?hidden=${this.view !== 'margins'} .json=${this.docJson} .label=${this.docLabel} .recording=${this.recording}></gt-margins-panel>`;
  }

  private renderView() {
    const { run, runJson } = this;
    if (this.view === 'compare') {
      return html`<gt-compare-panel
        .snapshots=${this.snapshots}
        .current=${run && runJson ? { json: runJson, metrics: run.metrics, renderedSeconds: run.renderedSeconds } : null}
        .compared=${this.compared}
      ></gt-compare-panel>`;
    }
    if (!run) return html`<p class="empty">${this.renderState === 'failed' ? 'No render yet (see the message above).' : 'Rendering the first excerpt…'}</p>`;
    switch (this.view) {
      case 'traces':
        return html`<gt-trace-stack .traces=${tracesOf(run)} .shading=${shadingOf(run)} .playheadSeconds=${this.playheadSeconds}></gt-trace-stack>`;
      case 'spectrum':
        return html`<gt-spectrum-view
          .spectra=${run.spectra}
          .colours=${{ source: TRACE_COLOURS.source, 'far end': TRACE_COLOURS['far end'], 'LED current': TRACE_COLOURS['transmitter.led'] }}
        ></gt-spectrum-view>`;
      case 'transfer': {
        const mic = run.taps.find((t) => t.name === 'microphone.volts');
        const led = run.taps.find((t) => t.name === 'transmitter.led');
        return html`<gt-transfer-view
          .micVolts=${mic?.samples ?? null}
          .ledAmperes=${led?.samples ?? null}
          .factor=${led ? Math.round(led.sampleRateHertz / run.sampleRateHertz) : 1}
          .cutoffAmperes=${run.report.led.cutoffThresholdAmperes}
          .restingAmperes=${run.report.led.restingAmperes}
        ></gt-transfer-view>`;
      }
      case 'report':
        return html`<gt-report-view .run=${run}></gt-report-view>`;
    }
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-view-panel': GtViewPanel;
  }
}
