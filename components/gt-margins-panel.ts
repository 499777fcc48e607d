import { LitElement, css, html, nothing } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { findHeadroom, type HeadroomResult } from '../src/analysis/headroom.ts';
import { LINK_METRICS, type MetricName } from '../src/analysis/link-metrics.ts';
import { spreadOf } from '../src/analysis/spread.ts';
import { runSweep, type SweepRow } from '../src/analysis/sweep-run.ts';
import { runTolerance, type ToleranceResult } from '../src/analysis/tolerance-run.ts';
import { InputError } from '../src/errors.ts';
import type { RecordingData } from '../src/worker/messages.ts';
import type { MarginMarker, MarginSeries } from './gt-margin-plot.ts';
import { MarginTask } from './support/margin-task.ts';
import { histogram, levelSweepPoints, loadForMargins, PAGE_TOLERANCES, pageHeadroomOptions, SWEEP_METRICS, toleranceInputs, withTone } from './support/margin-runs.ts';
import type { JsonObject } from './support/scenario-doc.ts';
import './gt-margin-plot.ts';

const MARKER_COLOURS = ['#ff6b6b', '#ffb547', '#e6d27a', '#c9a0ff'];
const fixed = (v: number | null | undefined, digits: number) => (v === null || v === undefined ? '—' : v.toFixed(digits));

/**
 * Margins of the current settings, computed in Web Workers by the same
 * analysis code as `glowtalk headroom/sweep/tolerance`: the headroom levels
 * of a 1 kHz tone, THD and LED cut-off against the level, and the spread of a
 * figure over a tolerance run. One analysis at a time, with progress and cancel.
 */
@customElement('gt-margins-panel')
export class GtMarginsPanel extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.85rem; color: var(--gt-text, #e2e6ea); }
    section { border-top: 1px solid var(--gt-line, #2c333d); padding: 0.5rem 0; }
    h3 { font-size: 0.92rem; margin: 0 0 0.3rem; }
    p.note { color: var(--gt-muted, #9aa3ad); font-size: 0.78rem; margin: 0.2rem 0; }
    .row { display: flex; flex-wrap: wrap; gap: 0.6rem; align-items: center; margin: 0.3rem 0; }
    input { width: 4.5rem; font: inherit; background: #1b2027; color: inherit; border: 1px solid var(--gt-line, #2c333d); }
    select, button { font: inherit; }
    .bar { display: flex; gap: 0.6rem; align-items: center; min-height: 1.6rem; }
    progress { width: 14rem; }
    .failed { color: #ff6b6b; }
    table { border-collapse: collapse; font-size: 0.8rem; margin: 0.3rem 0; }
    th, td { padding: 0.1rem 0.6rem; text-align: right; border-bottom: 1px solid var(--gt-line, #2c333d); }
    th:first-child, td:first-child { text-align: left; }
  `;

  /** The document being edited (circuits inline) and its label. */
  @property({ attribute: false }) json: JsonObject | null = null;
  @property() label = 'scenario';
  /** The recording the scenario's source names, when it is one. */
  @property({ attribute: false }) recording: RecordingData | null = null;

  @state() private headroom: HeadroomResult | null = null;
  @state() private sweep: SweepRow[] | null = null;
  @state() private tolerance: ToleranceResult | null = null;
  @state() private metric: MetricName | null = null;
  @state() private sweepSettings = { fromDbSpl: 60, toDbSpl: 110, steps: 11, seconds: 0.3 };
  @state() private tolerancePlan = { runs: 50, seed: 1 };

  private readonly task = new MarginTask(this);

  override render() {
    const t = this.task;
    return html`
      <p class="note">On the current settings, in Web Workers, with the analysis code of <code>glowtalk headroom</code>, <code>sweep</code> and <code>tolerance</code>.</p>
      <div class="bar" data-margins-state=${t.state}>
        ${t.running ? html`<progress max="1" .value=${t.progress} data-margins-progress></progress><button @click=${() => t.cancel()} data-margins-cancel>Cancel</button>` : nothing}
        <span class=${t.state === 'failed' ? 'failed' : ''} data-margins-message>${t.message}</span>
      </div>
      ${this.renderHeadroom()} ${this.renderSweep()} ${this.renderTolerance()}
    `;
  }

  private renderHeadroom() {
    const h = this.headroom;
    return html`<section>
      <h3>Headroom (1 kHz tone)</h3>
      <div class="row"><button ?disabled=${this.task.running || !this.json} @click=${this.runHeadroom} data-margins-run="headroom">Find headroom</button>
        <span class="note">0.3 s tone renders, bracket and bisect to ±0.25 dB.</span></div>
      ${h
        ? html`<table data-headroom-table>
            <tr><th>criterion</th><th>level, dB SPL</th><th>bracket, dB SPL</th><th>renders</th></tr>
            ${h.criteria.map((c) => {
              const x = c.crossing;
              return html`<tr data-headroom-row>
                <td>${c.label}</td>
                <td>${x.found ? x.levelDb.toFixed(2) : x.reason === 'never' ? `not reached up to ${pageHeadroomOptions(0.3).maxDbSpl}` : x.reason === 'always' ? 'already at the lowest level' : 'message' in x ? x.message : '—'}</td>
                <td>${x.found ? `${x.belowDb.toFixed(2)} – ${x.aboveDb.toFixed(2)}` : '—'}</td>
                <td>${x.evaluations}</td>
              </tr>`;
            })}
          </table>
          <p class="note">Scenario level ${h.startDbSpl.toFixed(1)} dB SPL; ${h.probes.length} distinct renders.</p>`
        : nothing}
    </section>`;
  }

  private renderSweep() {
    const s = this.sweepSettings;
    const rows = this.sweep;
    const num = (key: keyof typeof s, step: string) =>
      html`<input type="number" step=${step} .value=${String(s[key])} data-sweep=${key} @input=${(e: Event) => (this.sweepSettings = { ...s, [key]: Number((e.target as HTMLInputElement).value) })} />`;
    const value = (row: SweepRow, m: MetricName) => (row.outcome.ok ? (row.outcome.result.metrics.values[m] ?? null) : null);
    return html`<section>
      <h3>Level sweep (1 kHz tone)</h3>
      <div class="row">
        <label>from ${num('fromDbSpl', '1')} to ${num('toDbSpl', '1')} dB SPL</label><label>${num('steps', '1')} levels</label><label>${num('seconds', '0.1')} s renders</label>
        <button ?disabled=${this.task.running || !this.json} @click=${this.runSweep} data-margins-run="sweep">Run sweep</button>
      </div>
      ${rows
        ? html`<gt-margin-plot
              data-sweep-plot
              xLabel="dB SPL"
              .x=${rows.map((r) => r.levelDbSpl)}
              .series=${[
                { label: 'THD', unit: '%', colour: '#7bd88f', scale: 'y', values: rows.map((r) => value(r, 'thdPercent')) },
                { label: 'LED cut-off', unit: 'of the time', colour: '#ff6b6b', scale: 'y2', values: rows.map((r) => value(r, 'cutoffFraction')) },
              ] satisfies MarginSeries[]}
              .markers=${this.headroomMarkers()}
            ></gt-margin-plot>
            <table data-sweep-table>
              <tr><th>level, dB SPL</th><th>THD, %</th><th>LED cut-off, fraction</th><th>SINAD, dB</th><th>far end, dBV</th></tr>
              ${rows.map(
                (r) => html`<tr data-sweep-row>
                  <td>${r.levelDbSpl.toFixed(1)}</td>
                  ${r.outcome.ok
                    ? html`<td>${fixed(value(r, 'thdPercent'), 3)}</td><td>${fixed(value(r, 'cutoffFraction'), 4)}</td><td>${fixed(value(r, 'sinadDb'), 1)}</td><td>${fixed(value(r, 'farEndDbv'), 1)}</td>`
                    : html`<td colspan="4" class="failed">${r.outcome.error}</td>`}
                </tr>`,
              )}
            </table>`
        : nothing}
    </section>`;
  }

  private renderTolerance() {
    const p = this.tolerancePlan;
    const r = this.tolerance;
    const metric = this.metric;
    const num = (key: keyof typeof p) =>
      html`<input type="number" step="1" min="0" .value=${String(p[key])} data-tolerance=${key} @input=${(e: Event) => (this.tolerancePlan = { ...p, [key]: Number((e.target as HTMLInputElement).value) })} />`;
    const t = PAGE_TOLERANCES;
    let plot: unknown = nothing;
    if (r && metric) {
      const values = r.rows.filter((row) => row.run.index !== null).map((row) => (row.outcome.ok ? (row.outcome.result.metrics.values[metric] ?? null) : null));
      const finite = values.filter((v): v is number => v !== null);
      const h = histogram(finite);
      const spread = spreadOf(values);
      const unit = LINK_METRICS[metric].unit;
      plot = html`<gt-margin-plot
          data-tolerance-plot
          bars
          .xLabel=${`${metric}, ${unit}`}
          .x=${Array.from({ length: h.counts.length }, (_, i) => (h.edges[i] + h.edges[i + 1]) / 2)}
          .series=${[{ label: 'runs', unit: 'runs', colour: '#8fb3ff', scale: 'y', values: Array.from(h.counts) }] satisfies MarginSeries[]}
        ></gt-margin-plot>
        <p class="note" data-tolerance-spread>
          ${spread
            ? `${spread.count} runs: min ${spread.min.toPrecision(4)}, 5 % ${spread.p5.toPrecision(4)}, median ${spread.median.toPrecision(4)}, 95 % ${spread.p95.toPrecision(4)}, max ${spread.max.toPrecision(4)} ${unit}.`
            : 'No run measured this figure.'}
          ${r.failedRuns > 0 ? `${r.failedRuns} runs failed.` : ''}
        </p>`;
    }
    return html`<section>
      <h3>Tolerance run</h3>
      <div class="row">
        <label>${num('runs')} runs</label><label>seed ${num('seed')}</label>
        <span class="note">resistors ±${t.resistorPercent} %, capacitors ±${t.capacitorPercent} %, transistor gain ${t.betaRange?.join('–')}, uniform</span>
        <button ?disabled=${this.task.running || !this.json} @click=${this.runTolerance} data-margins-run="tolerance">Run tolerance</button>
      </div>
      ${r
        ? html`<div class="row">
              <label>figure
                <select data-tolerance-metric @change=${(e: Event) => (this.metric = (e.target as HTMLSelectElement).value as MetricName)}>
                  ${r.spreads.map((s) => html`<option value=${s.metric} ?selected=${s.metric === metric}>${s.metric} (${LINK_METRICS[s.metric].unit})</option>`)}
                </select>
              </label>
            </div>
            ${plot}
            <p class="note">Same runs as <code>glowtalk tolerance FILE --runs ${p.runs} --seed ${p.seed} --beta ${t.betaRange?.join(':')}</code> (each run drawn from the seed and its index only).</p>`
        : nothing}
    </section>`;
  }

  private headroomMarkers(): MarginMarker[] {
    const found = (this.headroom?.criteria ?? []).flatMap((c) => (c.crossing.found ? [{ x: c.crossing.levelDb, label: c.label }] : []));
    return found.map((m, i) => ({ ...m, colour: MARKER_COLOURS[i % MARKER_COLOURS.length] }));
  }

  private get inputs() {
    if (!this.json) throw new Error('no scenario loaded');
    const scenario = loadForMargins(this.json, this.label);
    const recording = scenario.source.kind === 'recording' && this.recording ? this.recording : undefined;
    if (scenario.source.kind === 'recording' && !recording) throw new InputError('source.file', `the recording "${scenario.source.file}" loaded (import it, or let the page render once)`, 'none loaded');
    return { json: this.json, scenario, recording };
  }

  private runHeadroom = () =>
    void this.task.run('Headroom', async (pool, progress) => {
      const { scenario } = this.inputs;
      // About 30 distinct renders for four criteria is typical; the bar stops short until the end.
      const result = await findHeadroom(withTone(scenario), undefined, pool, pageHeadroomOptions(0.3), (_p, n) => progress(Math.min(0.95, n / 30)));
      this.headroom = result;
      return (s, w) => `Headroom: ${result.probes.length} renders in ${s.toFixed(1)} s on ${w} workers.`;
    });

  private runSweep = () =>
    void this.task.run('Level sweep', async (pool, progress) => {
      const points = levelSweepPoints(this.inputs.json, this.label, this.sweepSettings);
      const rows = await runSweep(points, SWEEP_METRICS, pool, (done, total) => progress(done / total));
      this.sweep = rows;
      return (s, w) => `Level sweep: ${rows.length} renders in ${s.toFixed(1)} s on ${w} workers.`;
    });

  private runTolerance = () =>
    void this.task.run('Tolerance run', async (pool, progress) => {
      const { runs, seed } = this.tolerancePlan;
      if (!(Number.isInteger(runs) && runs >= 1 && runs <= 10000)) throw new InputError('runs', 'a whole number of runs from 1 to 10000', `got ${runs}`);
      if (!(Number.isInteger(seed) && seed >= 0 && seed <= 0xffffffff)) throw new InputError('seed', 'a whole-number seed from 0 to 4294967295', `got ${seed}`);
      const { scenario, recording } = this.inputs;
      const input = toleranceInputs(scenario, recording);
      const result = await runTolerance(input.scenario, input.recording, PAGE_TOLERANCES, { runs, seed, corners: false }, input.metrics, pool, (done, total) => progress(done / total));
      this.tolerance = result;
      if (!this.metric || !input.metrics.includes(this.metric)) this.metric = input.metrics.includes('minLedMilliamperes') ? 'minLedMilliamperes' : input.metrics[0];
      return (s, w) => `Tolerance run: ${result.rows.length} renders of ${input.seconds} s in ${s.toFixed(1)} s on ${w} workers.`;
    });
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-margins-panel': GtMarginsPanel;
  }
}
