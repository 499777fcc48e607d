import { LitElement, css, html, nothing, unsafeCSS, type PropertyValues } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import uPlot from 'uplot';
import uPlotCss from 'uplot/dist/uPlot.min.css?inline';
import type { DisplaySpectrum } from '../src/worker/messages.ts';
import { PLOT } from './support/plot-theme.ts';

/** Labels at 1, 2 and 5 of each decade only; the other log ticks stay bare. */
function hertzLabel(hertz: number | null): string {
  if (hertz === null || !(hertz > 0)) return '';
  const mantissa = Math.round(hertz / 10 ** Math.floor(Math.log10(hertz) + 1e-9));
  if (![1, 2, 5].includes(mantissa)) return '';
  return hertz >= 1000 ? `${Number((hertz / 1000).toPrecision(3))}k` : `${Number(hertz.toPrecision(3))}`;
}

/**
 * Averaged spectra of the source, the far end and the LED current on a log
 * frequency axis, each in dB re its own total power, so shapes and
 * distortion products compare whatever the units.
 */
@customElement('gt-spectrum-view')
export class GtSpectrumView extends LitElement {
  static override styles = [
    unsafeCSS(uPlotCss),
    css`
      :host { display: block; }
      p { font-size: 0.78rem; color: var(--gt-muted, #9aa3ad); margin: 0.2rem 0 0.4rem; }
      .u-legend { font-size: 0.75rem; color: var(--gt-text, #e2e6ea); }
    `,
  ];

  @property({ attribute: false }) spectra: DisplaySpectrum[] = [];
  @property({ attribute: false }) colours: Record<string, string> = {};

  private plot: uPlot | null = null;
  private resizeObserver: ResizeObserver | null = null;

  override connectedCallback(): void {
    super.connectedCallback();
    this.resizeObserver = new ResizeObserver((entries) => {
      const width = Math.floor(entries[0].contentRect.width);
      if (this.plot && width > 0 && width !== this.plot.width) this.plot.setSize({ width, height: this.plot.height });
    });
    this.resizeObserver.observe(this);
  }

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.resizeObserver?.disconnect();
    this.plot?.destroy();
    this.plot = null;
  }

  override render() {
    return html`<p>Welch-averaged (Hann, 16384-point segments), strongest bin per 1/24 octave, dB re each signal's total power.</p>
      <div class="plot" data-spectrum></div>
      ${this.spectra.length === 0 ? html`<p>No spectra yet.</p>` : nothing}`;
  }

  protected override updated(changed: PropertyValues<this>): void {
    if (!changed.has('spectra')) return;
    this.plot?.destroy();
    this.plot = null;
    if (this.spectra.length === 0) return;
    const longest = this.spectra.reduce((a, b) => (b.hertz.length > a.hertz.length ? b : a));
    const n = longest.hertz.length;
    const series: uPlot.Series[] = [{ label: 'Hz', value: (_u, v) => (v === null ? '' : `${v.toFixed(0)} Hz`) }];
    const ys: (number | null)[][] = [];
    for (const s of this.spectra) {
      const y: (number | null)[] = new Array(n).fill(null);
      for (let i = 0; i < Math.min(n, s.levelDb.length); i++) y[i] = s.levelDb[i];
      ys.push(y);
      series.push({ label: s.name, stroke: this.colours[s.name] ?? '#8fb3ff', width: 1.2, points: { show: false }, value: (_u, v) => (v === null ? '—' : `${v.toFixed(1)} dB`) });
    }
    const data = [longest.hertz, ...ys] as uPlot.AlignedData;
    const width = Math.max(300, Math.floor(this.getBoundingClientRect().width));
    this.plot = new uPlot(
      {
        width,
        height: 360,
        scales: { x: { time: false, distr: 3 }, y: { range: (_u, min, max) => [Math.max(-140, Math.floor(min / 10) * 10), Math.ceil(max / 10) * 10 + 5] } },
        axes: [
          { stroke: PLOT.text, font: PLOT.font, grid: { stroke: PLOT.grid }, ticks: { stroke: PLOT.tick }, values: (_u, v) => v.map(hertzLabel) },
          { stroke: PLOT.text, font: PLOT.font, grid: { stroke: PLOT.grid }, ticks: { stroke: PLOT.tick }, size: 50, label: 'dBr', labelFont: PLOT.font },
        ],
        series,
        cursor: { points: { show: false } },
      },
      data,
      this.renderRoot.querySelector<HTMLDivElement>('.plot')!,
    );
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-spectrum-view': GtSpectrumView;
  }
}
