import { LitElement, html, nothing } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { isUserFacing } from '../src/errors.ts';
import type { Scenario } from '../src/scenario/index.ts';
import type { BiasTables, RenderedLink } from '../src/worker/messages.ts';
import { applyEdit, withoutLabel } from './support/apply-edit.ts';
import { DEMOS, bundledRecordingUrl, fetchBundledRecording } from './support/demos.ts';
import type { BlockId } from './support/field-catalogue.ts';
import { download, readWavFile, safeStem, wavBytes } from './support/file-actions.ts';
import { RenderClient, RenderFailure } from './support/render-client.ts';
import { baseName, docFromText, loadDoc, readAt, type ScenarioDoc } from './support/scenario-doc.ts';
import { exportSignal, listenSignals, rmsAboutMean, shadingOf, tracesOf } from './support/run-views.ts';
import { workbenchStyles } from './support/workbench-styles.ts';
import * as store from './support/workbench-store.ts';
import type { FieldEditDetail } from './gt-value-field.ts';
import type { RenderState } from './gt-render-bar.ts';
import type { TimeRange } from './gt-trace-stack.ts';
import './gt-bias-table.ts';
import './gt-block-settings.ts';
import './gt-cautions.ts';
import './gt-chain-strip.ts';
import './gt-compare-panel.ts';
import './gt-file-bar.ts';
import './gt-listen-bar.ts';
import './gt-margins-panel.ts';
import './gt-parts-table.ts';
import './gt-render-bar.ts';
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

/** Quiet time after an edit before the link re-renders by itself. */
const RENDER_DEBOUNCE_MS = 600;

/**
 * The workbench page: owns the scenario being edited, the last good render,
 * the bias points, the snapshots and the messages; its children show and
 * edit. Renders run in a worker and start by themselves after a change.
 */
@customElement('gt-workbench')
export class GtWorkbench extends LitElement {
  static override styles = workbenchStyles;

  @state() private doc: ScenarioDoc | null = null;
  @state() private scenario: Scenario | null = null;
  @state() private demoId = '';
  @state() private fieldErrors: Record<string, string> = {};
  @state() private recording: store.StoredRecording | null = null;
  @state() private run: RenderedLink | null = null;
  /** The document the shown render was made from (identity tells whether it is stale). */
  @state() private runJson: ScenarioDoc['json'] | null = null;
  @state() private bias: BiasTables | null = null;
  @state() private biasJson: ScenarioDoc['json'] | null = null;
  @state() private renderState: RenderState = 'idle';
  @state() private progress = 0;
  @state() private renderMessage = '';
  @state() private excerptSeconds: number | null = 3;
  @state() private block: BlockId = 'transmitter';
  @state() private view: ViewId = 'traces';
  @state() private notice: { tone: 'error' | 'info'; text: string } | null = null;
  @state() private snapshots: store.SnapshotMeta[] = [];
  @state() private compared: store.Snapshot | null = null;
  @state() private selection: TimeRange | null = null;
  @state() private playhead: number | null = null;

  private client = new RenderClient();
  /** Completed renders and bias solves, shown as data-renders / data-bias-solves for scripts and tests. */
  private renderCount = 0;
  private biasCount = 0;
  private renderTimer = 0;
  private saveTimer = 0;

  override connectedCallback(): void {
    super.connectedCallback();
    this.addEventListener('dragover', (e) => e.preventDefault());
    this.addEventListener('drop', (e) => this.onDrop(e));
    void this.restore();
  }

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.client.dispose();
  }

  // ---- start-up -------------------------------------------------------------------------------

  private async restore(): Promise<void> {
    try {
      const [saved, recording, snapshots] = await Promise.all([store.loadSavedScenario(), store.loadSavedRecording(), store.listSnapshots()]);
      this.snapshots = snapshots;
      this.recording = recording ?? null;
      if (saved) {
        try {
          this.setDoc(saved, loadDoc(saved));
          this.scheduleRender(0);
          return;
        } catch (error) {
          this.notice = { tone: 'error', text: `The scenario kept from last time no longer loads (${(error as Error).message}); a demo is loaded instead.` };
        }
      }
    } catch (error) {
      this.notice = { tone: 'info', text: `This browser's storage is not available (${(error as Error).message}): changes will not survive a reload.` };
    }
    if (DEMOS.length > 0) this.loadDemo(DEMOS[0].id);
  }

  private loadDemo(id: string): void {
    const demo = DEMOS.find((d) => d.id === id);
    if (!demo) return;
    try {
      const doc = demo.load();
      this.setDoc(doc, loadDoc(doc));
      this.demoId = id;
      this.fieldErrors = {};
      this.persistScenario(0);
      this.scheduleRender(0);
    } catch (error) {
      this.showError(`Demo ${id} does not load`, error);
    }
  }

  private setDoc(doc: ScenarioDoc, scenario: Scenario): void {
    this.doc = doc;
    this.scenario = scenario;
  }

  // ---- editing --------------------------------------------------------------------------------

  private onFieldEdit(event: CustomEvent<FieldEditDetail>): void {
    if (!this.doc) return;
    const { path, value } = event.detail;
    const outcome = applyEdit(this.doc, path, value);
    if (!outcome.ok) {
      this.fieldErrors = { ...this.fieldErrors, [path]: outcome.reason };
      return;
    }
    const { [path]: _fixed, ...rest } = this.fieldErrors;
    this.fieldErrors = rest;
    this.setDoc(outcome.doc, outcome.scenario);
    this.persistScenario();
    this.scheduleRender();
  }

  private persistScenario(delayMs = 300): void {
    clearTimeout(this.saveTimer);
    this.saveTimer = window.setTimeout(() => {
      if (this.doc) store.saveScenario(this.doc).catch(() => undefined);
    }, delayMs);
  }

  // ---- rendering ------------------------------------------------------------------------------

  private scheduleRender(delayMs = RENDER_DEBOUNCE_MS): void {
    clearTimeout(this.renderTimer);
    this.renderState = this.client.busy ? 'rendering' : 'waiting';
    this.renderTimer = window.setTimeout(() => void this.startRender(), delayMs);
  }

  private async startRender(): Promise<void> {
    const doc = this.doc;
    const scenario = this.scenario;
    if (!doc || !scenario) return;
    let recording: store.StoredRecording | null = null;
    if (scenario.source.kind === 'recording') {
      recording = await this.recordingFor(scenario.source.file, doc);
      if (!recording) {
        this.renderState = 'failed';
        this.renderMessage = `The source is the recording "${scenario.source.file}": import that WAV (or drop it on the page).`;
        return;
      }
    }
    this.renderState = 'rendering';
    this.progress = 0;
    this.renderMessage = '';
    try {
      const result = await this.client.render(
        {
          scenario: doc.json,
          files: {},
          label: doc.label,
          recording: recording ? { samples: recording.samples, sampleRateHertz: recording.sampleRateHertz, label: recording.name } : null,
          excerptSeconds: this.excerptSeconds,
        },
        {
          onBias: (bias) => {
            this.bias = bias;
            this.biasJson = doc.json;
            this.dataset.biasSolves = String(++this.biasCount);
          },
          onProgress: (fraction) => (this.progress = fraction),
        },
      );
      this.run = result;
      this.runJson = doc.json;
      this.renderState = 'idle';
      this.dataset.renders = String(++this.renderCount);
    } catch (error) {
      if (error instanceof RenderFailure && error.cancelled) return;
      this.renderState = 'failed';
      this.renderMessage = withoutLabel((error as Error).message, doc.label);
    }
  }

  private cancelRender(): void {
    clearTimeout(this.renderTimer);
    this.client.cancel();
    this.renderState = 'idle';
  }

  /** The recording a scenario names: the one imported or kept, else a bundled sample. */
  private async recordingFor(file: string, doc: ScenarioDoc): Promise<store.StoredRecording | null> {
    if (this.recording && baseName(this.recording.name) === baseName(file)) return this.recording;
    const url = bundledRecordingUrl(file, doc.baseDir);
    if (!url) return null;
    try {
      this.recording = await fetchBundledRecording(url, baseName(file));
      return this.recording;
    } catch (error) {
      this.showError(`The bundled recording ${file} does not load`, error);
      return null;
    }
  }

  // ---- files ----------------------------------------------------------------------------------

  private async importWav(file: File): Promise<void> {
    if (!this.doc) return;
    try {
      const recording = await readWavFile(file);
      const outcome = applyEdit(this.doc, 'source', { kind: 'recording', file: file.name, level: readAt(this.doc.json, 'source.level') ?? { dbSpl: 72 } });
      if (!outcome.ok) throw new Error(outcome.reason);
      this.recording = recording;
      this.setDoc(outcome.doc, outcome.scenario);
      this.notice = { tone: 'info', text: `Source: ${file.name} (${(recording.samples.length / recording.sampleRateHertz).toFixed(2)} s at ${recording.sampleRateHertz} Hz).` };
      await store.saveRecording(recording).catch(() => undefined);
      this.persistScenario(0);
      this.scheduleRender(0);
    } catch (error) {
      this.showError(`Could not use ${file.name} as the source; the previous source and render are kept`, error);
    }
  }

  private exportWav(id: string): void {
    const run = this.run;
    const scenario = this.scenario;
    if (!run || !scenario || !this.doc) return;
    const signal = exportSignal(run, id, scenario);
    if (!signal) return;
    try {
      const { bytes, clippedSamples } = wavBytes(signal);
      download(bytes, `${safeStem(this.doc.label)}-${signal.stem}.wav`, 'audio/wav');
      this.notice = clippedSamples > 0 ? { tone: 'error', text: `${clippedSamples} samples clipped in the exported ${signal.stem} WAV: lower the listening gain.` } : null;
    } catch (error) {
      this.showError('Could not write the WAV', error);
    }
  }

  private saveScenarioFile(): void {
    if (!this.doc) return;
    download(`${JSON.stringify(this.doc.json, null, 2)}\n`, `${safeStem(this.doc.label)}.json`, 'application/json');
  }

  private async openScenarioFiles(files: File[]): Promise<void> {
    const texts = await Promise.all(files.map(async (f) => [f.name, await f.text()] as const));
    const scenarioEntry = texts.find(([, text]) => /"format"\s*:\s*"glowtalk\.scenario\/1"/.test(text)) ?? (texts.length === 1 ? texts[0] : undefined);
    if (!scenarioEntry) {
      this.notice = { tone: 'error', text: 'None of the files opened is a glowtalk.scenario/1 file; the current scenario is kept.' };
      return;
    }
    try {
      const circuits = Object.fromEntries(texts.filter((t) => t !== scenarioEntry));
      const { doc, scenario } = docFromText(scenarioEntry[1], scenarioEntry[0], circuits);
      this.setDoc(doc, scenario);
      this.demoId = '';
      this.fieldErrors = {};
      this.notice = { tone: 'info', text: `Opened ${scenarioEntry[0]}.` };
      this.persistScenario(0);
      this.scheduleRender(0);
    } catch (error) {
      this.showError(`Could not open ${scenarioEntry[0]}; the current scenario is kept`, error);
    }
  }

  private onDrop(event: DragEvent): void {
    event.preventDefault();
    const files = [...(event.dataTransfer?.files ?? [])];
    const wav = files.find((f) => /\.wav$/i.test(f.name));
    if (wav) void this.importWav(wav);
    else if (files.length > 0) void this.openScenarioFiles(files);
  }

  private showError(prefix: string, error: unknown): void {
    const message = isUserFacing(error) || error instanceof Error ? (error as Error).message : String(error);
    this.notice = { tone: 'error', text: `${prefix}: ${message}` };
  }

  // ---- snapshots ------------------------------------------------------------------------------

  private async keepSnapshot(name: string): Promise<void> {
    const run = this.run;
    if (!run || !this.runJson || !this.doc) return;
    const snapshot: store.Snapshot = {
      id: crypto.randomUUID(),
      name,
      createdIso: new Date().toISOString(),
      label: this.doc.label,
      renderedSeconds: run.renderedSeconds,
      json: this.runJson,
      metrics: run.metrics,
      summary: run.summary,
      farEnd: Float32Array.from(run.farEndVolts),
      sampleRateHertz: run.sampleRateHertz,
    };
    try {
      this.snapshots = await store.saveSnapshot(snapshot);
      this.notice = { tone: 'info', text: `Kept “${name}”.` };
    } catch (error) {
      this.showError('Could not keep the snapshot', error);
    }
  }

  private async compareWith(id: string | null): Promise<void> {
    this.compared = id === null ? null : ((await store.loadSnapshot(id)) ?? null);
  }

  private async deleteSnapshot(id: string): Promise<void> {
    this.snapshots = await store.deleteSnapshot(id);
    if (this.compared?.id === id) this.compared = null;
  }

  // ---- view -----------------------------------------------------------------------------------

  override render() {
    const doc = this.doc;
    const run = this.run;
    const stale = run !== null && this.runJson !== doc?.json;
    const title = doc ? String(readAt(doc.json, 'title') ?? doc.label) : 'loading…';
    const mic = run?.taps.find((t) => t.name === 'microphone.volts');
    return html`
      <header>
        <h1><span class="glow">glowtalk</span> workbench</h1>
        <span class="title" data-title>${title}</span>
        <gt-cautions></gt-cautions>
      </header>
      <gt-file-bar
        .demos=${DEMOS.map((d) => ({ id: d.id, label: d.title }))}
        .currentDemo=${this.demoId}
        .exportable=${run ? listenSignals(run, null).map((s) => ({ id: s.id, label: s.label })) : []}
        @demo-load=${(e: CustomEvent<string>) => this.loadDemo(e.detail)}
        @scenario-files=${(e: CustomEvent<File[]>) => void this.openScenarioFiles(e.detail)}
        @scenario-save=${this.saveScenarioFile}
        @wav-import=${(e: CustomEvent<File>) => void this.importWav(e.detail)}
        @wav-export=${(e: CustomEvent<string>) => this.exportWav(e.detail)}
      ></gt-file-bar>
      ${this.notice
        ? html`<div class="notice ${this.notice.tone}" role=${this.notice.tone === 'error' ? 'alert' : 'status'} data-notice=${this.notice.tone}>
            ${this.notice.text} <button @click=${() => (this.notice = null)} aria-label="dismiss">×</button>
          </div>`
        : nothing}
      <gt-chain-strip
        .json=${doc?.json ?? null}
        .report=${run?.report ?? null}
        .bias=${this.bias}
        .micRmsVolts=${mic ? rmsAboutMean(mic.samples) : null}
        .selected=${this.block}
        .stale=${stale}
        @block-select=${(e: CustomEvent<BlockId>) => (this.block = e.detail)}
      ></gt-chain-strip>
      <gt-render-bar
        .state=${this.renderState}
        .fraction=${this.progress}
        .message=${this.renderMessage}
        .excerptSeconds=${this.excerptSeconds}
        .stale=${stale}
        .lastRun=${run ? `${run.renderedSeconds.toFixed(2)} s of ${run.fullSeconds.toFixed(2)} s in ${run.wallSeconds.toFixed(1)} s (${(run.renderedSeconds / Math.max(1e-9, run.wallSeconds)).toFixed(2)}× real time)` : ''}
        @render-now=${() => this.scheduleRender(0)}
        @render-cancel=${this.cancelRender}
        @excerpt-change=${(e: CustomEvent<number | null>) => ((this.excerptSeconds = e.detail), this.scheduleRender(0))}
      ></gt-render-bar>
      <div class="split">
        <section class="settings" @field-edit=${this.onFieldEdit}>${this.renderSettings()}</section>
        <section class="views">
          <nav role="tablist">
            ${VIEWS.map(([id, label]) => html`<button role="tab" data-view=${id} aria-selected=${this.view === id ? 'true' : 'false'} @click=${() => (this.view = id)}>${label}</button>`)}
            ${stale ? html`<span class="stale-note">showing the render of earlier settings</span>` : nothing}
          </nav>
          <div class="view">${this.renderView()}</div>
        </section>
      </div>
      <footer>
        <gt-listen-bar
          .signals=${run ? listenSignals(run, this.compared) : []}
          .loopRange=${this.selection}
          .abPair=${this.compared ? { a: 'far-end', b: 'snapshot', bLabel: `“${this.compared.name}”` } : null}
          @playhead=${(e: CustomEvent<number | null>) => (this.playhead = e.detail)}
        ></gt-listen-bar>
      </footer>
    `;
  }

  private renderSettings() {
    const doc = this.doc;
    if (!doc) return html`<p>Loading…</p>`;
    const circuitBlock = this.block === 'transmitter' || this.block === 'receiver' ? this.block : null;
    const extra = this.recording ? { 'source.file': [this.recording.name] } : {};
    return html`<gt-block-settings .block=${this.block} .json=${doc.json} .errors=${this.fieldErrors} .extraChoices=${extra}>
      ${circuitBlock
        ? html`<gt-parts-table .block=${circuitBlock} .circuit=${readAt(doc.json, `${circuitBlock}.circuit`)} .errors=${this.fieldErrors}></gt-parts-table>
            <gt-bias-table
              .heading=${circuitBlock === 'transmitter' ? 'Transmitter bias point' : 'Receiver bias point (resting light)'}
              .bias=${this.bias?.[circuitBlock] ?? null}
              .addedParts=${this.bias?.addedParts ?? []}
              .stale=${this.biasJson !== doc.json}
            ></gt-bias-table>`
        : nothing}
    </gt-block-settings>`;
  }

  private renderView() {
    const run = this.run;
    if (this.view === 'margins') return html`<gt-margins-panel></gt-margins-panel>`;
    if (this.view === 'compare') {
      return html`<gt-compare-panel
        .snapshots=${this.snapshots}
        .current=${run && this.runJson ? { json: this.runJson, metrics: run.metrics, renderedSeconds: run.renderedSeconds } : null}
        .compared=${this.compared}
        @snapshot-keep=${(e: CustomEvent<{ name: string }>) => void this.keepSnapshot(e.detail.name)}
        @snapshot-compare=${(e: CustomEvent<{ id: string | null }>) => void this.compareWith(e.detail.id)}
        @snapshot-delete=${(e: CustomEvent<{ id: string }>) => void this.deleteSnapshot(e.detail.id)}
      ></gt-compare-panel>`;
    }
    if (!run) return html`<p class="empty">${this.renderState === 'failed' ? 'No render yet (see the message above).' : 'Rendering the first excerpt…'}</p>`;
    switch (this.view) {
      case 'traces':
        return html`<gt-trace-stack
          .traces=${tracesOf(run)}
          .shading=${shadingOf(run)}
          .playheadSeconds=${this.playhead}
          @range-select=${(e: CustomEvent<TimeRange | null>) => (this.selection = e.detail)}
        ></gt-trace-stack>`;
      case 'spectrum':
        return html`<gt-spectrum-view .spectra=${run.spectra} .colours=${{ source: '#c9a0ff', 'far end': '#7bd88f', 'LED current': '#ffb547' }}></gt-spectrum-view>`;
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
    'gt-workbench': GtWorkbench;
  }
}
