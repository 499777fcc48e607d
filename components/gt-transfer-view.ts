import { LitElement, css, html, unsafeCSS, type PropertyValues } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import uPlot from 'uplot';
import uPlotCss from 'uplot/dist/uPlot.min.css?inline';
import { formatFigure } from './support/value-text.ts';
import { PLOT, valueAxis } from './support/plot-theme.ts';

/** Points drawn at most; more only blurs the cloud and costs time. */
const MAX_POINTS = 30000;

/**
 * The transmitter's transfer: LED current against the microphone voltage,
 * one dot per audio sample. A straight thin line is a linear stage; bending
 * near the floor is the LED running into cut-off, a loop is the coupling
 * capacitors' memory. The cut-off threshold and the resting point are marked.
 */
@customElement('gt-transfer-view')
export class GtTransferView extends LitElement {
  static override styles = [
    unsafeCSS(uPlotCss),
    css`
      :host { display: block; }
      p { font-size: 0.78rem; color: var(--gt-muted, #9aa3ad); margin: 0.2rem 0 0.4rem; }
    `,
  ];

  @property({ attribute: false }) micVolts: ArrayLike<number> | null = null;
  @property({ attribute: false }) ledAmperes: ArrayLike<number> | null = null;
  /** Internal samples per audio sample (the LED tap runs at the internal rate). */
  @property({ type: Number }) factor = 4;
  @property({ type: Number }) cutoffAmperes = 0;
  @property({ type: Number }) restingAmperes = 0;

  private plot: uPlot | null = null;
  private points: { x: Float64Array; y: Float64Array } = { x: new Float64Array(0), y: new Float64Array(0) };

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.plot?.destroy();
    this.plot = null;
  }

  override render() {
    return html`<p>LED current against microphone voltage, one dot per audio sample (${this.points.x.length} shown). Dashed: cut-off threshold
        ${formatFigure(this.cutoffAmperes, 'A')}; ring: resting point ${formatFigure(this.restingAmperes, 'A', 4)}.</p>
      <div class="plot" data-transfer></div>`;
  }

  protected override willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('micVolts') || changed.has('ledAmperes') || changed.has('factor')) this.points = this.pairs();
  }

  protected override updated(changed: PropertyValues<this>): void {
    if (!changed.has('micVolts') && !changed.has('ledAmperes') && !changed.has('cutoffAmperes')) return;
    this.plot?.destroy();
    this.plot = null;
    const { x, y } = this.points;
    if (x.length === 0) return;
    const width = Math.max(300, Math.floor(this.getBoundingClientRect().width));
    let lo = Math.min(0, this.cutoffAmperes);
    let hi = this.restingAmperes;
    for (let i = 0; i < y.length; i++) {
      if (y[i] < lo) lo = y[i];
      if (y[i] > hi) hi = y[i];
    }
    const pad = (hi - lo) * 0.05 || 1e-3;
    this.plot = new uPlot(
      {
        width,
        height: 380,
        legend: { show: false },
        scales: { x: { time: false }, y: { range: () => [lo - pad, hi + pad] } },
        axes: [{ ...valueAxis('V'), size: 34 }, valueAxis('A')],
        series: [{}, { stroke: 'transparent', paths: () => null, points: { show: false } }],
        cursor: { points: { show: false } },
        hooks: { draw: [(u) => this.drawCloud(u)] },
      },
      [x, y],
      this.renderRoot.querySelector<HTMLDivElement>('.plot')!,
    );
  }

  /** (mic volts, LED amperes) pairs at the audio rate, thinned, sorted by voltage for uPlot. */
  private pairs(): { x: Float64Array; y: Float64Array } {
    const mic = this.micVolts;
    const led = this.ledAmperes;
    if (!mic || !led) return { x: new Float64Array(0), y: new Float64Array(0) };
    const count = Math.min(mic.length, Math.floor(led.length / this.factor));
    const stride = Math.max(1, Math.ceil(count / MAX_POINTS));
    const n = Math.floor(count / stride);
    const order = new Uint32Array(n);
    for (let i = 0; i < n; i++) order[i] = i * stride;
    order.sort((a, b) => mic[a] - mic[b]);
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      // Internal sample k·factor is the instant of audio sample k (the half-band upsampler keeps the input samples).
      x[i] = mic[order[i]];
      y[i] = led[order[i] * this.factor];
    }
    return { x, y };
  }

  private drawCloud(u: uPlot): void {
    const ctx = u.ctx;
    const { x, y } = this.points;
    const { left, top, width, height } = u.bbox;
    ctx.save();
    ctx.beginPath();
    ctx.rect(left, top, width, height);
    ctx.clip();
    ctx.fillStyle = 'rgba(255, 181, 71, 0.45)';
    const size = Math.max(1, Math.round(devicePixelRatio * 1.5));
    for (let i = 0; i < x.length; i++) ctx.fillRect(u.valToPos(x[i], 'x', true), u.valToPos(y[i], 'y', true), size, size);
    // Cut-off threshold.
    const cut = u.valToPos(this.cutoffAmperes, 'y', true);
    ctx.strokeStyle = '#ff6b6b';
    ctx.setLineDash([6, 4]);
    ctx.beginPath();
    ctx.moveTo(left, cut);
    ctx.lineTo(left + width, cut);
    ctx.stroke();
    ctx.setLineDash([]);
    // Resting point: no signal, LED at its bias.
    ctx.strokeStyle = PLOT.text;
    ctx.lineWidth = 1.5 * devicePixelRatio;
    ctx.beginPath();
    ctx.arc(u.valToPos(0, 'x', true), u.valToPos(this.restingAmperes, 'y', true), 6 * devicePixelRatio, 0, 2 * Math.PI);
    ctx.stroke();
    ctx.restore();
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-transfer-view': GtTransferView;
  }
}
