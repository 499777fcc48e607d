import { LitElement, css, html, nothing, unsafeCSS, type PropertyValues } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import uPlot from 'uplot';
import uPlotCss from 'uplot/dist/uPlot.min.css?inline';
import type { TimeInterval } from '../src/link/chain/intervals.ts';
import { formatFigure } from './support/value-text.ts';
import { MinMaxTrace } from './support/min-max.ts';
import { timeAxis, valueAxis } from './support/plot-theme.ts';

export interface TraceSpec {
  id: string;
  label: string;
  /** Name in the cursor readout. */
  short: string;
  unit: string;
  samples: ArrayLike<number>;
  rateHertz: number;
  colour: string;
}

/** Time intervals to shade on every trace (LED cut-off, transistor saturation). */
export interface ShadeSpec {
  label: string;
  /** Band over the plot (light) and marker strip along its top (solid). */
  colour: string;
  marker: string;
  intervals: TimeInterval[];
}

/** Height of each marker strip along the top of a plot, CSS pixels. */
const MARKER_PX = 4;

export interface TimeRange {
  startSeconds: number;
  endSeconds: number;
}

const PLOT_HEIGHT = 118;

/**
 * Signals of one render stacked on a shared time axis. Drag to select a
 * stretch (then zoom to it or loop it), wheel to zoom about the pointer,
 * Shift+wheel to pan, double-click to see everything. Each plot draws the
 * min and max of the samples under every pixel column, so long renders stay
 * quick and no peak is hidden. Shaded bands mark the report's intervals.
 *
 * @fires range-select - TimeRange | null, when the selection changes
 */
@customElement('gt-trace-stack')
export class GtTraceStack extends LitElement {
  static override styles = [
    unsafeCSS(uPlotCss),
    css`
      :host { display: block; }
      .bar { display: flex; flex-wrap: wrap; gap: 0.4rem; align-items: center; font-size: 0.78rem; margin-bottom: 0.3rem; color: var(--gt-muted, #9aa3ad); }
      .bar button { font: inherit; background: var(--gt-panel-2, #232831); color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-line, #2c333d); border-radius: 3px; padding: 0.1rem 0.5rem; cursor: pointer; }
      .bar button:disabled { opacity: 0.4; cursor: default; }
      .readout { font-variant-numeric: tabular-nums; min-height: 1.1rem; font-size: 0.78rem; color: var(--gt-text, #e2e6ea); margin: 0.2rem 0; white-space: nowrap; overflow: hidden; text-overflow: ellipsis; }
      .readout b { font-weight: 500; }
      .trace { position: relative; }
      .name { position: absolute; left: 80px; top: 2px; z-index: 2; font-size: 0.72rem; pointer-events: none; padding: 0 0.3rem; background: rgba(16, 20, 26, 0.7); border-radius: 2px; }
      .legend { display: flex; gap: 0.8rem; font-size: 0.72rem; }
      .swatch { display: inline-block; width: 0.8rem; height: 0.6rem; margin-right: 0.25rem; vertical-align: middle; }
      .playhead { position: absolute; top: 0; bottom: 0; width: 1px; background: #ffffff; opacity: 0.8; pointer-events: none; }
      .u-select { background: rgba(88, 196, 220, 0.18); }
    `,
  ];

  @property({ attribute: false }) traces: TraceSpec[] = [];
  @property({ attribute: false }) shading: ShadeSpec[] = [];
  @property({ attribute: false }) playheadSeconds: number | null = null;

  // Not reactive: the plots are redrawn by setView, the template does not show it.
  private view: TimeRange = { startSeconds: 0, endSeconds: 1 };
  @state() private selection: TimeRange | null = null;
  @state() private readout = '';

  private plots: uPlot[] = [];
  private decimators: MinMaxTrace[] = [];
  private playheads: HTMLDivElement[] = [];
  private resizeObserver: ResizeObserver | null = null;
  private width = 800;
  private durationSeconds = 1;
  private readoutFrame = 0;

  override connectedCallback(): void {
    super.connectedCallback();
    this.resizeObserver = new ResizeObserver((entries) => {
      const width = Math.floor(entries[0].contentRect.width);
      if (width > 0 && width !== this.width) {
        this.width = width;
        for (const u of this.plots) u.setSize({ width, height: u.height });
        this.refreshData();
      }
    });
    this.resizeObserver.observe(this);
  }

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.resizeObserver?.disconnect();
    this.destroyPlots();
  }

  override render() {
    const sel = this.selection;
    return html`
      <div class="bar">
        <button @click=${this.zoomToSelection} ?disabled=${!sel}>Zoom to selection</button>
        <button @click=${() => this.setView(0, this.durationSeconds)}>Show all</button>
        <button @click=${() => this.zoomBy(0.5)}>Zoom in</button>
        <button @click=${() => this.zoomBy(2)}>Zoom out</button>
        <button @click=${this.clearSelection} ?disabled=${!sel}>Clear selection</button>
        <span>${sel ? `selected ${sel.startSeconds.toFixed(4)}–${sel.endSeconds.toFixed(4)} s` : 'drag to select · wheel zooms · Shift+wheel pans · double-click shows all'}</span>
        <span class="legend">
          ${this.shading.map((s) => html`<span><span class="swatch" style="background:${s.marker}"></span>${s.label} (${s.intervals.length}${s.intervals.length >= 2000 ? '+' : ''})</span>`)}
        </span>
      </div>
      <div class="readout" data-readout>${this.readout || '\u00a0'}</div>
      ${this.traces.map(
        (t) => html`<div class="trace" data-trace=${t.id}><span class="name" style="color:${t.colour}">${t.label}</span></div>`,
      )}
      ${this.traces.length === 0 ? html`<p>No traces yet: the scenario has not been rendered.</p>` : nothing}
    `;
  }

  protected override updated(changed: PropertyValues<this>): void {
    if (changed.has('traces')) this.buildPlots();
    else if (changed.has('shading')) for (const u of this.plots) u.redraw(false);
    if (changed.has('playheadSeconds') || changed.has('traces')) this.placePlayheads();
  }

  /** Current selection (seconds), for the page's loop control. */
  get selectedRange(): TimeRange | null {
    return this.selection;
  }

  private buildPlots(): void {
    this.destroyPlots();
    this.decimators = this.traces.map((t) => new MinMaxTrace(t.samples, t.rateHertz));
    this.durationSeconds = Math.max(1e-3, ...this.decimators.map((d) => d.durationSeconds));
    const keep = this.view.endSeconds <= this.durationSeconds && this.view.endSeconds > this.view.startSeconds && this.plots.length > 0;
    if (!keep) this.view = { startSeconds: 0, endSeconds: this.durationSeconds };
    const containers = [...this.renderRoot.querySelectorAll<HTMLDivElement>('.trace')];
    this.width = Math.max(200, Math.floor(this.getBoundingClientRect().width) || this.width);
    this.traces.forEach((trace, i) => {
      const last = i === this.traces.length - 1;
      const data = this.dataFor(i);
      const u = new uPlot(
        {
          width: this.width,
          height: PLOT_HEIGHT + (last ? 30 : 0),
          legend: { show: false },
          // The same padding on every plot keeps their time axes aligned.
          padding: [6, 18, 0, 0],
          scales: { x: { time: false, auto: false, range: () => [this.view.startSeconds, this.view.endSeconds] } },
          axes: [timeAxis(last), valueAxis(trace.unit)],
          series: [{}, { stroke: trace.colour, width: 1, points: { show: false } }],
          cursor: { sync: { key: `gt-traces-${this.traceKey}` }, drag: { x: true, y: false, setScale: false }, points: { show: false } },
          select: { show: true, left: 0, top: 0, width: 0, height: 0 },
          hooks: {
            drawClear: [(plot) => this.shade(plot)],
            setSelect: [(plot) => this.onSelect(plot)],
            setCursor: [(plot) => this.onCursor(plot)],
          },
        },
        data,
        containers[i],
      );
      u.over.addEventListener('wheel', (event) => this.onWheel(event, u), { passive: false });
      u.over.addEventListener('dblclick', () => this.setView(0, this.durationSeconds));
      const playhead = document.createElement('div');
      playhead.className = 'playhead';
      playhead.style.display = 'none';
      u.over.appendChild(playhead);
      this.playheads.push(playhead);
      this.plots.push(u);
    });
    if (this.selection) this.showSelection(null);
  }

  /** A key unique to this element, so two stacks do not share cursors. */
  private readonly traceKey = Math.random().toString(36).slice(2);

  private destroyPlots(): void {
    for (const u of this.plots) u.destroy();
    this.plots = [];
    this.playheads = [];
  }

  private dataFor(i: number): uPlot.AlignedData {
    const columns = Math.max(100, this.width - 80);
    const { x, y } = this.decimators[i].view(this.view.startSeconds, this.view.endSeconds, columns);
    return [x, y];
  }

  private refreshData(): void {
    this.plots.forEach((u, i) => {
      u.batch(() => {
        u.setData(this.dataFor(i), false);
        u.setScale('x', { min: this.view.startSeconds, max: this.view.endSeconds });
      });
    });
    this.showSelection(null);
    this.placePlayheads();
  }

  setView(startSeconds: number, endSeconds: number): void {
    const span = Math.min(this.durationSeconds, Math.max(endSeconds - startSeconds, 2e-5));
    let start = Math.max(0, startSeconds);
    if (start + span > this.durationSeconds) start = this.durationSeconds - span;
    this.view = { startSeconds: start, endSeconds: start + span };
    this.refreshData();
  }

  private zoomBy(factor: number, aboutSeconds?: number): void {
    const { startSeconds, endSeconds } = this.view;
    const centre = aboutSeconds ?? (startSeconds + endSeconds) / 2;
    this.setView(centre - (centre - startSeconds) * factor, centre + (endSeconds - centre) * factor);
  }

  private onWheel(event: WheelEvent, u: uPlot): void {
    event.preventDefault();
    const span = this.view.endSeconds - this.view.startSeconds;
    const sideways = event.shiftKey || Math.abs(event.deltaX) > Math.abs(event.deltaY);
    if (sideways) {
      const delta = (event.shiftKey ? event.deltaY : event.deltaX) || event.deltaY;
      const shift = Math.sign(delta) * span * 0.15;
      this.setView(this.view.startSeconds + shift, this.view.endSeconds + shift);
    } else {
      const about = u.posToVal(event.offsetX, 'x');
      this.zoomBy(event.deltaY > 0 ? 1.25 : 0.8, about);
    }
  }

  private zoomToSelection(): void {
    if (this.selection) this.setView(this.selection.startSeconds, this.selection.endSeconds);
  }

  private clearSelection(): void {
    this.selection = null;
    for (const u of this.plots) u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
    this.dispatchEvent(new CustomEvent<TimeRange | null>('range-select', { detail: null, bubbles: true, composed: true }));
  }

  private onSelect(u: uPlot): void {
    if (u.select.width < 3) return;
    const a = u.posToVal(u.select.left, 'x');
    const b = u.posToVal(u.select.left + u.select.width, 'x');
    this.selection = { startSeconds: Math.max(0, Math.min(a, b)), endSeconds: Math.min(this.durationSeconds, Math.max(a, b)) };
    this.showSelection(u);
    this.dispatchEvent(new CustomEvent<TimeRange | null>('range-select', { detail: this.selection, bubbles: true, composed: true }));
  }

  /** Draws the selection on every plot (the one it was made on draws its own). */
  private showSelection(source: uPlot | null): void {
    const sel = this.selection;
    for (const u of this.plots) {
      if (u === source) continue;
      if (!sel) {
        u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
        continue;
      }
      const left = Math.max(0, u.valToPos(sel.startSeconds, 'x'));
      const right = Math.min(u.over.clientWidth, u.valToPos(sel.endSeconds, 'x'));
      u.setSelect({ left, top: 0, width: Math.max(0, right - left), height: u.over.clientHeight }, false);
    }
  }

  private onCursor(u: uPlot): void {
    const left = u.cursor.left;
    if (left === undefined || left < 0) return;
    const seconds = u.posToVal(left, 'x');
    cancelAnimationFrame(this.readoutFrame);
    this.readoutFrame = requestAnimationFrame(() => {
      const parts = this.traces.map((t, i) => {
        const v = this.decimators[i]?.valueAt(seconds);
        return `${t.short} ${v === null || v === undefined ? '—' : formatFigure(v, t.unit, 4)}`;
      });
      this.readout = `t = ${seconds.toFixed(5)} s   ·   ${parts.join('   ·   ')}`;
    });
  }

  private shade(u: uPlot): void {
    const ctx = u.ctx;
    const { left, top, width, height } = u.bbox;
    const { startSeconds, endSeconds } = this.view;
    const strip = MARKER_PX * devicePixelRatio;
    ctx.save();
    this.shading.forEach((s, k) => {
      for (const interval of s.intervals) {
        const end = interval.startSeconds + interval.durationSeconds;
        if (end < startSeconds || interval.startSeconds > endSeconds) continue;
        const x0 = Math.max(left, u.valToPos(interval.startSeconds, 'x', true));
        const x1 = Math.min(left + width, u.valToPos(end, 'x', true));
        // At least a pixel wide, so a short episode is still seen when zoomed out.
        const w = Math.max(1, x1 - x0);
        ctx.fillStyle = s.colour;
        ctx.fillRect(x0, top, w, height);
        ctx.fillStyle = s.marker;
        ctx.fillRect(x0, top + k * strip, w, strip);
      }
    });
    ctx.restore();
  }

  private placePlayheads(): void {
    const t = this.playheadSeconds;
    this.plots.forEach((u, i) => {
      const line = this.playheads[i];
      if (!line) return;
      if (t === null || t < this.view.startSeconds || t > this.view.endSeconds) {
        line.style.display = 'none';
        return;
      }
      line.style.display = 'block';
      line.style.left = `${u.valToPos(t, 'x')}px`;
    });
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-trace-stack': GtTraceStack;
  }
}
