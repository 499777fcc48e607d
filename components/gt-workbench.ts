import { LitElement, html, nothing } from 'lit';
import { customElement, state } from 'lit/decorators.js';
import { isUserFacing } from '../src/errors.ts';
import type { Scenario } from '../src/scenario/index.ts';
import type { RecordingData } from '../src/worker/messages.ts';
import { applyEdit } from './support/apply-edit.ts';
import { DEMOS, bundledRecordingUrl, fetchBundledRecording } from './support/demos.ts';
import type { BlockId } from './support/field-catalogue.ts';
import { download, readWavFile, safeStem, wavBytes } from './support/file-actions.ts';
import { RenderController, type Prepared } from './support/render-controller.ts';
import { baseName, docFromText, loadDoc, readAt, type ScenarioDoc } from './support/scenario-doc.ts';
import { exportChoices, exportSignal, listenSignals, rmsAboutMean } from './support/run-views.ts';
import { workbenchStyles } from './support/workbench-styles.ts';
import { SnapshotController } from './support/snapshot-controller.ts';
import * as store from './support/workbench-store.ts';
import type { FieldEditDetail } from './gt-value-field.ts';
import type { TimeRange } from './gt-trace-stack.ts';
import './gt-bias-table.ts';
import './gt-block-settings.ts';
import './gt-cautions.ts';
import './gt-chain-strip.ts';
import './gt-file-bar.ts';
import './gt-listen-bar.ts';
import './gt-parts-table.ts';
import './gt-render-bar.ts';
import './gt-view-panel.ts';

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
  @state() private block: BlockId = 'transmitter';
  @state() private notice: { tone: 'error' | 'info'; text: string } | null = null;
  @state() private selection: TimeRange | null = null;
  @state() private playhead: number | null = null;

  private renders = new RenderController(this, () => this.prepareRender());
  private snapshots = new SnapshotController(this);
  private saveTimer = 0;

  override connectedCallback(): void {
    super.connectedCallback();
    this.addEventListener('dragover', (e) => e.preventDefault());
    this.addEventListener('drop', (e) => this.onDrop(e));
    void this.restore();
  }

  // ---- start-up -------------------------------------------------------------------------------

  private async restore(): Promise<void> {
    try {
      const [saved, recording] = await Promise.all([store.loadSavedScenario(), store.loadSavedRecording(), this.snapshots.load()]);
      this.recording = recording ?? null;
      if (saved) {
        try {
          this.setDoc(saved, loadDoc(saved));
          this.renders.schedule(0);
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
      this.renders.schedule(0);
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
    this.renders.schedule();
  }

  private persistScenario(delayMs = 300): void {
    clearTimeout(this.saveTimer);
    this.saveTimer = window.setTimeout(() => {
      if (this.doc) store.saveScenario(this.doc).catch(() => undefined);
    }, delayMs);
  }

  // ---- rendering ------------------------------------------------------------------------------

  /** The request for the current document, fetching a bundled recording if the scenario names one. */
  private async prepareRender(): Promise<Prepared> {
    const doc = this.doc;
    const scenario = this.scenario;
    if (!doc || !scenario) return null;
    let recording: store.StoredRecording | null = null;
    if (scenario.source.kind === 'recording') {
      recording = await this.recordingFor(scenario.source.file, doc);
      if (!recording) return { problem: `The source is the recording "${scenario.source.file}": import that WAV (or drop it on the page).` };
    }
    return {
      doc,
      request: {
        scenario: doc.json,
        files: {},
        label: doc.label,
        recording: recording ? { samples: recording.samples, sampleRateHertz: recording.sampleRateHertz, label: recording.name } : null,
      },
    };
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
      this.renders.schedule(0);
    } catch (error) {
      this.showError(`Could not use ${file.name} as the source; the previous source and render are kept`, error);
    }
  }

  private exportWav(id: string): void {
    const run = this.renders.run;
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
      this.renders.schedule(0);
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
    const { run, runJson } = this.renders;
    if (!run || !runJson || !this.doc) return;
    try {
      await this.snapshots.keep(name, run, runJson, this.doc.label);
      this.notice = { tone: 'info', text: `Kept “${name}”.` };
    } catch (error) {
      this.showError('Could not keep the snapshot', error);
    }
  }

  // ---- view -----------------------------------------------------------------------------------

  override render() {
    const doc = this.doc;
    const r = this.renders;
    const run = r.run;
    const stale = run !== null && r.runJson !== doc?.json;
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
        .exportable=${run ? exportChoices(run) : []}
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
        .bias=${r.bias}
        .micRmsVolts=${mic ? rmsAboutMean(mic.samples) : null}
        .selected=${this.block}
        .stale=${stale}
        @block-select=${(e: CustomEvent<BlockId>) => (this.block = e.detail)}
      ></gt-chain-strip>
      <gt-render-bar
        .state=${r.state}
        .fraction=${r.progress}
        .message=${r.message}
        .excerptSeconds=${r.excerptSeconds}
        .stale=${stale}
        .lastRun=${run ? `${run.renderedSeconds.toFixed(2)} s of ${run.fullSeconds.toFixed(2)} s in ${run.wallSeconds.toFixed(1)} s (${(run.renderedSeconds / Math.max(1e-9, run.wallSeconds)).toFixed(2)}× real time)` : ''}
        @render-now=${() => this.renders.schedule(0)}
        @render-cancel=${() => r.cancel()}
        @excerpt-change=${(e: CustomEvent<number | null>) => ((r.excerptSeconds = e.detail), r.schedule(0))}
      ></gt-render-bar>
      <div class="split">
        <section class="settings" @field-edit=${this.onFieldEdit}>${this.renderSettings()}</section>
        <section class="views">
          <gt-view-panel
            .run=${run}
            .runJson=${r.runJson}
            .stale=${stale}
            .renderState=${r.state}
            .playheadSeconds=${this.playhead}
            .snapshots=${this.snapshots.list}
            .compared=${this.snapshots.compared}
            .docJson=${doc?.json ?? null}
            .docLabel=${doc?.label ?? 'scenario'}
            .recording=${this.marginRecording()}
            @range-select=${(e: CustomEvent<TimeRange | null>) => (this.selection = e.detail)}
            @snapshot-keep=${(e: CustomEvent<{ name: string }>) => void this.keepSnapshot(e.detail.name)}
            @snapshot-compare=${(e: CustomEvent<{ id: string | null }>) => void this.snapshots.compareWith(e.detail.id)}
            @snapshot-delete=${(e: CustomEvent<{ id: string }>) => void this.snapshots.remove(e.detail.id)}
          ></gt-view-panel>
        </section>
      </div>
      <footer>
        <gt-listen-bar
          .signals=${run ? listenSignals(run, this.snapshots.compared) : []}
          .loopRange=${this.selection}
          .abPair=${this.snapshots.compared ? { a: 'far-end', b: 'snapshot', bLabel: `“${this.snapshots.compared.name}”` } : null}
          @playhead=${(e: CustomEvent<number | null>) => (this.playhead = e.detail)}
        ></gt-listen-bar>
      </footer>
    `;
  }

  /** The recording for the Margins tab (the same object while the recording is, so Lit sees no change). */
  private marginRecording(): RecordingData | null {
    const r = this.recording;
    if (!r) return null;
    if (this.marginRecordingCache?.from !== r) this.marginRecordingCache = { from: r, data: { samples: r.samples, sampleRateHertz: r.sampleRateHertz, label: r.name } };
    return this.marginRecordingCache.data;
  }
  private marginRecordingCache: { from: store.StoredRecording; data: RecordingData } | null = null;

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
              .bias=${this.renders.bias?.[circuitBlock] ?? null}
              .addedParts=${this.renders.bias?.addedParts ?? []}
              .stale=${this.renders.biasJson !== doc.json}
            ></gt-bias-table>`
        : nothing}
    </gt-block-settings>`;
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-workbench': GtWorkbench;
  }
}
