import { LitElement, css, html, nothing, svg } from 'lit';
import { customElement, property } from 'lit/decorators.js';
import type { RenderReport } from '../src/link/chain/report.ts';
import type { KernelBackend } from '../src/solver/kernel/step-kernel.ts';
import { formatFigure } from './support/value-text.ts';
import type { BiasTables } from '../src/worker/messages.ts';
import type { BlockId } from './support/field-catalogue.ts';
import { readAt, type JsonObject } from './support/scenario-doc.ts';

interface Badge {
  text: string;
  tone: 'bad' | 'warn';
}

interface BlockView {
  id: BlockId;
  name: string;
  key: string;
  sub: string;
  badges: Badge[];
  /** The link between this block and the next carries light, not volts. */
  lightAfter?: boolean;
}

const ICONS: Record<BlockId, ReturnType<typeof svg>> = {
  voice: svg`<path d="M3 12c2-5 4 5 6 0s4 5 6 0 4 5 6 0" fill="none" stroke="currentColor" stroke-width="1.6"/>`,
  microphone: svg`<rect x="9" y="3" width="6" height="11" rx="3" fill="none" stroke="currentColor" stroke-width="1.6"/><path d="M6 11a6 6 0 0 0 12 0M12 17v4" fill="none" stroke="currentColor" stroke-width="1.6"/>`,
  transmitter: svg`<path d="M5 6l9 6-9 6z" fill="none" stroke="currentColor" stroke-width="1.6"/><path d="M14 6v12M17 7l3-3M18 11l3-2" stroke="currentColor" stroke-width="1.6"/>`,
  light: svg`<path d="M2 12h4M9 12h4M16 12h4" stroke="currentColor" stroke-width="1.8"/><path d="M19 9l3 3-3 3" fill="none" stroke="currentColor" stroke-width="1.6"/>`,
  receiver: svg`<circle cx="14" cy="12" r="6" fill="none" stroke="currentColor" stroke-width="1.6"/><path d="M3 6l5 4M3 11l5 3" stroke="currentColor" stroke-width="1.6"/>`,
  speaker: svg`<path d="M4 9h4l5-4v14l-5-4H4z" fill="none" stroke="currentColor" stroke-width="1.6"/><path d="M16 9a4 4 0 0 1 0 6M19 6a8 8 0 0 1 0 12" fill="none" stroke="currentColor" stroke-width="1.6"/>`,
  solver: svg`<path d="M4 18V6M4 18h16M7 15l4-5 3 3 5-7" fill="none" stroke="currentColor" stroke-width="1.6"/>`,
};

const pct = (f: number) => `${(f * 100).toFixed(f < 0.01 ? 2 : 1)} %`;

/**
 * The whole link in one strip, voice to speaker, each block with its key
 * figure and a badge when the report saw it saturate or cut off. Clicking a
 * block opens its settings.
 *
 * @fires block-select - BlockId
 */
@customElement('gt-chain-strip')
export class GtChainStrip extends LitElement {
  static override styles = css`
    :host { display: block; }
    ol { list-style: none; display: grid; grid-template-columns: repeat(7, minmax(0, 1fr)); gap: 0; margin: 0; padding: 0; }
    li { position: relative; display: flex; }
    button { all: unset; box-sizing: border-box; cursor: pointer; flex: 1; margin-right: 14px; min-height: 6.2rem; padding: 0.45rem 0.55rem; border-radius: 6px; background: var(--gt-panel-2, #232831); border: 1px solid var(--gt-line, #2c333d); display: flex; flex-direction: column; gap: 0.15rem; }
    button:hover { border-color: #46505c; }
    button:focus-visible { outline: 2px solid var(--gt-accent, #ffb547); }
    button[aria-pressed='true'] { border-color: var(--gt-accent, #ffb547); box-shadow: 0 0 0 1px var(--gt-accent, #ffb547) inset; }
    li:not(:last-child)::after { content: ''; position: absolute; right: 2px; top: 50%; width: 10px; height: 2px; background: var(--gt-cyan, #58c4dc); }
    li.light::after { background: repeating-linear-gradient(90deg, var(--gt-accent, #ffb547) 0 3px, transparent 3px 5px); height: 3px; box-shadow: 0 0 6px var(--gt-accent, #ffb547); }
    li.solver::before { content: ''; }
    .head { display: flex; align-items: center; gap: 0.35rem; font-size: 0.72rem; letter-spacing: 0.04em; text-transform: uppercase; color: var(--gt-muted, #9aa3ad); }
    svg { width: 18px; height: 18px; color: var(--gt-cyan, #58c4dc); flex: none; }
    li.glow svg { color: var(--gt-accent, #ffb547); }
    .key { font-size: 1.02rem; font-weight: 600; font-variant-numeric: tabular-nums; color: var(--gt-text, #e2e6ea); }
    .sub { font-size: 0.74rem; color: var(--gt-muted, #9aa3ad); font-variant-numeric: tabular-nums; }
    .badges { display: flex; flex-wrap: wrap; gap: 0.2rem; margin-top: auto; }
    .badge { font-size: 0.68rem; padding: 0.05rem 0.35rem; border-radius: 8px; font-weight: 600; }
    .badge.bad { background: rgba(255, 107, 107, 0.18); color: #ff8c8c; border: 1px solid rgba(255, 107, 107, 0.5); }
    .badge.warn { background: rgba(255, 181, 71, 0.15); color: #ffc671; border: 1px solid rgba(255, 181, 71, 0.45); }
    .stale .key, .stale .sub { opacity: 0.55; }
    @media (max-width: 1100px) { ol { grid-template-columns: repeat(4, minmax(0, 1fr)); row-gap: 0.5rem; } }
  `;

  @property({ attribute: false }) json: JsonObject | null = null;
  @property({ attribute: false }) report: RenderReport | null = null;
  @property({ attribute: false }) bias: BiasTables | null = null;
  @property({ type: Number }) micRmsVolts: number | null = null;
  @property() selected: BlockId = 'transmitter';
  /** The figures are from settings older than those on screen. */
  @property({ type: Boolean }) stale = false;

  override render() {
    return html`<ol class=${this.stale ? 'stale' : ''} aria-label="The link, voice to speaker">
      ${this.blocks().map(
        (b) => html`<li class="${b.lightAfter ? 'light' : ''} ${b.id === 'transmitter' || b.id === 'light' ? 'glow' : ''}" data-block=${b.id}>
          <button aria-pressed=${b.id === this.selected ? 'true' : 'false'} @click=${() => this.select(b.id)}>
            <span class="head"><svg viewBox="0 0 24 24" aria-hidden="true">${ICONS[b.id]}</svg>${b.name}</span>
            <span class="key">${b.key}</span>
            <span class="sub">${b.sub}</span>
            ${b.badges.length > 0 ? html`<span class="badges">${b.badges.map((x) => html`<span class="badge ${x.tone}" data-badge>${x.text}</span>`)}</span>` : nothing}
          </button>
        </li>`,
      )}
    </ol>`;
  }

  private select(id: BlockId): void {
    this.dispatchEvent(new CustomEvent<BlockId>('block-select', { detail: id, bubbles: true, composed: true }));
  }

  private transistorBadges(circuit: 'transmitter' | 'receiver'): Badge[] {
    const badges: Badge[] = [];
    for (const t of this.report?.transistors ?? []) {
      if (t.circuit !== circuit) continue;
      if (t.saturation.count > 0) badges.push({ text: `${t.ref} saturates ${t.saturation.count}× (${pct(t.saturation.fraction)})`, tone: 'bad' });
      if (t.cutoff.count > 0) badges.push({ text: `${t.ref} cuts off ${t.cutoff.count}× (${pct(t.cutoff.fraction)})`, tone: 'warn' });
    }
    const bias = this.bias?.[circuit];
    for (const [ref, p] of Object.entries(bias?.parts ?? {})) {
      if ('region' in p && p.region !== 'active') badges.push({ text: `${ref} ${p.region} at rest`, tone: 'bad' });
    }
    return badges;
  }

  private blocks(): BlockView[] {
    const json = this.json;
    const r = this.report;
    const bias = this.bias;
    const level = json ? readAt(json, 'source.level') : undefined;
    const levelText =
      r !== null
        ? `${r.microphone.targetDbSpl.toFixed(1)} dB SPL`
        : level && typeof level === 'object' && !Array.isArray(level) && typeof level.dbSpl === 'number'
          ? `${level.dbSpl.toFixed(1)} dB SPL`
          : '—';
    const sourceKind = json ? String(readAt(json, 'source.kind') ?? '') : '';
    const ledRest = bias?.ledRestingAmperes ?? r?.led.restingAmperes ?? null;
    const ledBadges: Badge[] = [];
    if (r && r.led.cutoff.count > 0) ledBadges.push({ text: `LED cuts off ${r.led.cutoff.count}× (${pct(r.led.cutoff.fraction)})`, tone: 'bad' });
    const gain = r?.light.channelGain ?? null;
    const detectorWatts = bias?.restingDetectorWatts ?? r?.light.restingDetectorWatts ?? null;
    const ambient = json ? readAt(json, 'lightPath.ambient') : null;
    const detectorRegion = (() => {
      const ref = json ? String(readAt(json, 'receiver.detector') ?? '') : '';
      const p = bias?.receiver.parts[ref];
      return p && 'currents' in p ? `${ref} I_C ${formatFigure(p.currents.collector, 'A')} at rest` : 'bias not yet solved';
    })();
    const sens = json ? readAt(json, 'microphone.sensitivity') : undefined;
    return [
      {
        id: 'voice',
        name: 'Voice',
        key: levelText,
        sub: r ? `${sourceKind}, peaks ${r.microphone.peakDbSpl.toFixed(1)} dB SPL` : sourceKind,
        badges: [],
      },
      {
        id: 'microphone',
        name: 'Microphone',
        key: this.micRmsVolts !== null ? `${formatFigure(this.micRmsVolts, 'V')} rms` : typeof sens === 'number' ? `${sens} dBV/Pa` : '—',
        sub: typeof sens === 'number' ? `${sens} dBV/Pa` : '',
        badges: [],
      },
      {
        id: 'transmitter',
        name: 'Transmitter · LED',
        key: ledRest !== null ? `${formatFigure(ledRest, 'A')} bias` : '—',
        sub: r ? `swing ${formatFigure(r.led.minimumAmperes, 'A')} … ${formatFigure(r.led.maximumAmperes, 'A')}` : 'swing after the render',
        badges: [...ledBadges, ...this.transistorBadges('transmitter')],
        lightAfter: true,
      },
      {
        id: 'light',
        name: 'Light path',
        key: detectorWatts !== null ? formatFigure(detectorWatts, 'W') : '—',
        sub: `at the detector${gain !== null && gain > 0 ? ` · path ${(10 * Math.log10(gain)).toFixed(1)} dB` : ''}${ambient ? ' · ambient light' : ' · dark'}`,
        badges: [],
        lightAfter: true,
      },
      {
        id: 'receiver',
        name: 'Receiver',
        key: r ? `${r.farEnd.rmsDbv.toFixed(1)} dBV out` : '—',
        sub: detectorRegion,
        badges: this.transistorBadges('receiver'),
      },
      {
        id: 'speaker',
        name: 'Speaker',
        key: r ? `${formatFigure(r.farEnd.rmsVolts, 'V')} rms` : '—',
        sub: r ? `peak ${formatFigure(r.farEnd.peakVolts, 'V')} · WAV full scale ${formatFigure(r.farEnd.wavFullScaleVolts, 'V')}` : '',
        badges: r && r.farEnd.peakVolts > r.farEnd.wavFullScaleVolts ? [{ text: 'far-end WAV would clip', tone: 'warn' }] : [],
      },
      {
        id: 'solver',
        name: 'Solver',
        key: r ? `${formatFigure(r.internalRateHertz, 'Hz')}` : '—',
        sub: r ? `solver alone ${(r.durationSeconds / Math.max(1e-9, r.solver.wallSeconds)).toFixed(2)}× real time · ${kernelsText(r.solver.transmitterKernel, r.solver.receiverKernel)}` : '',
        badges: r && r.solver.subdividedSteps > 0 ? [{ text: `${r.solver.subdividedSteps} steps subdivided`, tone: 'warn' }] : [],
      },
    ];
  }
}

/** What the circuits' steps ran on, in a few words. */
function kernelsText(transmitter: KernelBackend | null, receiver: KernelBackend | null): string {
  const name = (k: KernelBackend | null): string => (k === 'wasm' ? 'WebAssembly' : k === 'js' ? 'JavaScript' : 'general loop');
  return transmitter === receiver ? `${name(transmitter)} kernels` : `transmitter ${name(transmitter)}, receiver ${name(receiver)}`;
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-chain-strip': GtChainStrip;
  }
}
