import { LitElement, css, html, unsafeCSS, type PropertyValues } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import uPlot from 'uplot';
import uPlotCss from 'uplot/dist/uPlot.min.css?inline';
import { PLOT } from './support/plot-theme.ts';

export interface MarginSeries {
  label: string;
  unit: string;
  colour: string;
  values: ReadonlyArray<number | null>;
  /** The left axis ('y') or the right one ('y2'). */
  scale: 'y' | 'y2';
}

/** A vertical line at an x value with a short label (headroom levels on the sweep). */
export interface MarginMarker {
  x: number;
  label: string;
  colour: string;
}

/**
 * One small uPlot chart of the Margins tab: lines with points against a
 * numeric x (a level sweep, with markers), or bars (a histogram, x = bin
 * centres). Redrawn when any property changes (they are replaced, not mutated).
 */
@customElement('gt-margin-plot')
export class GtMarginPlot extends LitElement {
  static override styles = [
    unsafeCSS(uPlotCss),
    css`
      :host { display: block; }
      .u-legend { font-size: 0.75rem; color: var(--gt-text, #e2e6ea); }
    `,
  ];

  @property({ attribute: false }) x: readonly number[] = [];
  @property({ attribute: false }) series: MarginSeries[] = [];
  @property({ attribute: false }) markers: MarginMarker[] = [];
  @property() xLabel = '';
  @property({ type: Boolean }) bars = false;
  @property({ type: Number }) height = 260;

  private plot: uPlot | null = null;

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.plot?.destroy();
    this.plot = null;
  }

  override render() {
    return html`<div class="plot" data-margin-plot></div>`;
  }

  protected override updated(_changed: PropertyValues<this>): void {
    this.plot?.destroy();
    this.plot = null;
    if (this.x.length === 0 || this.series.length === 0) return;
    const axis = (scale: string, side: number, unit: string): uPlot.Axis => ({
      scale,
      side,
      stroke: PLOT.text,
      font: PLOT.font,
      size: 56,
      label: unit,
      labelFont: PLOT.font,
      labelSize: 16,
      grid: { stroke: side === 3 ? PLOT.grid : 'transparent' },
      ticks: { stroke: PLOT.tick },
    });
    const left = this.series.find((s) => s.scale === 'y');
    const right = this.series.find((s) => s.scale === 'y2');
    const markers = this.markers;
    const barPaths = uPlot.paths.bars?.({ size: [0.9, Infinity] });
    const options: uPlot.Options = {
      width: Math.max(300, Math.floor(this.getBoundingClientRect().width) || 600),
      height: this.height,
      scales: { x: { time: false }, y: this.bars ? { range: (_u, _min, max) => [0, Math.max(1, Math.ceil(max * 1.15))] } : {}, y2: {} },
      axes: [
        { stroke: PLOT.text, font: PLOT.font, grid: { stroke: PLOT.grid }, ticks: { stroke: PLOT.tick }, label: this.xLabel, labelFont: PLOT.font, labelSize: 16 },
        axis('y', 3, left?.unit ?? ''),
        ...(right ? [axis('y2', 1, right.unit)] : []),
      ],
      series: [
        { label: this.xLabel },
        ...this.series.map(
          (s): uPlot.Series => ({
            label: s.label,
            scale: s.scale,
            stroke: s.colour,
            fill: this.bars ? `${s.colour}99` : undefined,
            width: 1.5,
            paths: this.bars ? barPaths : undefined,
            points: { show: !this.bars, size: 6 },
            value: (_u, v) => (v === null ? '—' : `${Number(v.toPrecision(4))} ${s.unit}`),
          }),
        ),
      ],
      hooks: {
        draw: [
          (u) => {
            const ctx = u.ctx;
            ctx.save();
            ctx.font = `${Math.round(11 * devicePixelRatio)}px system-ui, sans-serif`;
            markers.forEach((m, i) => {
              const px = u.valToPos(m.x, 'x', true);
              if (!(px >= u.bbox.left && px <= u.bbox.left + u.bbox.width)) return;
              ctx.strokeStyle = m.colour;
              ctx.fillStyle = m.colour;
              ctx.setLineDash([4 * devicePixelRatio, 3 * devicePixelRatio]);
              ctx.beginPath();
              ctx.moveTo(px, u.bbox.top);
              ctx.lineTo(px, u.bbox.top + u.bbox.height);
              ctx.stroke();
              ctx.fillText(m.label, px + 3 * devicePixelRatio, u.bbox.top + (12 + 13 * i) * devicePixelRatio);
            });
            ctx.restore();
          },
        ],
      },
    };
    const data = [Array.from(this.x), ...this.series.map((s) => Array.from(s.values))] as uPlot.AlignedData;
    this.plot = new uPlot(options, data, this.renderRoot.querySelector<HTMLDivElement>('.plot')!);
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-margin-plot': GtMarginPlot;
  }
}
