import { LitElement, css, html, nothing, type PropertyValues } from 'lit';
import { customElement, property, state } from 'lit/decorators.js';
import { DEFAULT_CEILING_DB } from '../src/audio/limiter.ts';
import { Player, toAudioBuffer } from '../src/audio/playback.ts';
import { MATCHED_RMS_DBFS, describeMatch, matchLevel, type MatchedSignal, type PlayableSignal } from './support/listening.ts';
import type { TimeRange } from './gt-trace-stack.ts';

interface Prepared {
  signal: PlayableSignal;
  match: MatchedSignal | null;
  buffer: AudioBuffer | null;
}

/**
 * Listening: play the clean source, the far end, any tap or a kept
 * snapshot; switch between them at the same position without a gap; loop
 * the stretch selected on the traces. Every signal is level-matched and goes
 * through the safe-level limiter; the volume only turns down. Before the
 * first playback a headphone caution must be acknowledged.
 *
 * @fires playhead - number | null, the playing position in seconds
 */
@customElement('gt-listen-bar')
export class GtListenBar extends LitElement {
  static override styles = css`
    :host { display: block; font-size: 0.82rem; }
    .row { display: flex; flex-wrap: wrap; align-items: center; gap: 0.5rem 0.8rem; }
    button, select { font: inherit; background: var(--gt-panel-2, #232831); color: var(--gt-text, #e2e6ea); border: 1px solid var(--gt-line, #2c333d); border-radius: 4px; padding: 0.2rem 0.6rem; cursor: pointer; }
    button.primary { background: #1f3b2a; border-color: #2f6b45; min-width: 5.5rem; }
    button.primary[data-playing='true'] { background: #3b2020; border-color: #6b2f2f; }
    button.ab { border-color: var(--gt-accent, #ffb547); }
    button:disabled, select:disabled { opacity: 0.45; cursor: default; }
    .pos { font-variant-numeric: tabular-nums; min-width: 6rem; }
    .note { color: var(--gt-muted, #9aa3ad); font-size: 0.76rem; }
    .caution { border: 1px solid var(--gt-accent, #ffb547); background: rgba(255, 181, 71, 0.08); border-radius: 6px; padding: 0.5rem 0.7rem; margin-bottom: 0.4rem; }
    .caution strong { color: var(--gt-accent, #ffb547); }
    input[type='range'] { width: 7rem; vertical-align: middle; }
    label { display: inline-flex; align-items: center; gap: 0.3rem; }
  `;

  @property({ attribute: false }) signals: PlayableSignal[] = [];
  @property({ attribute: false }) loopRange: TimeRange | null = null;
  /** A/B pair of signal ids (current far end vs snapshot far end), or null. */
  @property({ attribute: false }) abPair: { a: string; b: string; bLabel: string } | null = null;

  @state() private selectedId = 'far-end';
  @state() private playing = false;
  @state() private looping = false;
  @state() private cautionShown = false;
  @state() private cautionAccepted = false;
  @state() private position = 0;
  @state() private volumeDb = -12;
  @state() private problem = '';

  private context: AudioContext | null = null;
  private volume: GainNode | null = null;
  private player: Player | null = null;
  private prepared = new Map<string, Prepared>();
  private frame = 0;
  private pendingPlay = false;

  override disconnectedCallback(): void {
    super.disconnectedCallback();
    this.stop();
    void this.context?.close();
  }

  protected override willUpdate(changed: PropertyValues<this>): void {
    if (changed.has('signals')) {
      // Drop buffers of signals that changed; a playing one is swapped at the same position.
      for (const [id, p] of this.prepared) {
        const now = this.signals.find((s) => s.id === id);
        if (!now || now !== p.signal) this.prepared.delete(id);
      }
      if (!this.signals.some((s) => s.id === this.selectedId) && this.signals.length > 0) this.selectedId = this.signals.find((s) => s.id === 'far-end')?.id ?? this.signals[0].id;
      if (this.playing && this.player) {
        const buffer = this.bufferFor(this.selectedId);
        if (buffer) this.player.switchTo(buffer);
        else this.stop();
      }
    }
    if (changed.has('loopRange') && !this.loopRange && this.looping) this.looping = false;
  }

  override render() {
    const selected = this.signals.find((s) => s.id === this.selectedId) ?? null;
    const match = selected ? this.preparedFor(selected.id)?.match ?? null : null;
    const ab = this.abPair;
    return html`
      ${this.cautionShown && !this.cautionAccepted
        ? html`<div class="caution" role="alertdialog" aria-label="Headphone level caution" data-caution>
            <strong>Headphones: turn the volume down first.</strong> Simulated distortion and noise can be harsh. Start low and raise it slowly;
            long listening at high level harms hearing. The page limits peaks to ${DEFAULT_CEILING_DB} dBFS, but your device's volume is yours to set.
            <div class="row" style="margin-top:0.4rem">
              <button class="primary" data-accept-caution @click=${this.acceptCaution}>Volume is down — play</button>
              <button @click=${() => ((this.cautionShown = false), (this.pendingPlay = false))}>Not now</button>
            </div>
          </div>`
        : nothing}
      <div class="row">
        <button class="primary" data-play data-playing=${this.playing ? 'true' : 'false'} ?disabled=${!selected} @click=${this.togglePlay}>
          ${this.playing
            ? html`<svg viewBox="0 0 16 16" width="10" height="10" aria-hidden="true"><rect x="2" y="2" width="12" height="12" fill="currentColor"/></svg> Stop`
            : '▶ Play'}
        </button>
        <button data-rewind title="back to the start" aria-label="back to the start" @click=${this.rewind}>
          <svg viewBox="0 0 16 16" width="12" height="12" aria-hidden="true"><path d="M3 2v12M14 2L5 8l9 6z" fill="currentColor" stroke="currentColor" stroke-width="1.5"/></svg>
        </button>
        <label>Signal
          <select data-signal @change=${(e: Event) => this.choose((e.target as HTMLSelectElement).value)}>
            ${this.signals.map((s) => html`<option .value=${s.id} ?selected=${s.id === this.selectedId}>${s.label}</option>`)}
          </select>
        </label>
        ${ab
          ? html`<button class="ab" data-ab @click=${this.flipAb} title="switch at the same position">
              A/B: ${this.selectedId === ab.b ? html`<b>B</b> ${ab.bLabel}` : html`<b>A</b> current far end`}
            </button>`
          : nothing}
        <label title=${this.loopRange ? '' : 'select a stretch on the traces first'}>
          <input type="checkbox" data-loop .checked=${this.looping} ?disabled=${!this.loopRange} @change=${this.toggleLoop} />
          Loop ${this.loopRange ? `${this.loopRange.startSeconds.toFixed(3)}–${this.loopRange.endSeconds.toFixed(3)} s` : 'selection'}
        </label>
        <span class="pos" data-position>${this.position.toFixed(2)} s</span>
        <label>Volume <input type="range" min="-40" max="0" step="1" .value=${String(this.volumeDb)} @input=${this.onVolume} /> ${this.volumeDb} dB</label>
      </div>
      <div class="note" data-level-note>
        Level-matched: every signal plays at ${MATCHED_RMS_DBFS} dBFS rms (mean removed), then the limiter (always on, ceiling ${DEFAULT_CEILING_DB} dBFS).
        ${selected && match ? describeMatch(selected, match) : selected ? `${selected.label} is silent.` : ''}
      </div>
      ${this.problem ? html`<div class="note" role="alert" style="color:var(--gt-bad,#ff6b6b)">${this.problem}</div>` : nothing}
    `;
  }

  private preparedFor(id: string): Prepared | null {
    const signal = this.signals.find((s) => s.id === id);
    if (!signal) return null;
    let p = this.prepared.get(id);
    if (!p || p.signal !== signal) {
      p = { signal, match: matchLevel(signal), buffer: null };
      this.prepared.set(id, p);
    }
    return p;
  }

  private bufferFor(id: string): AudioBuffer | null {
    const p = this.preparedFor(id);
    if (!p || !p.match || !this.context) return null;
    p.buffer ??= toAudioBuffer(this.context, p.match.normalised, p.signal.rateHertz, MATCHED_RMS_DBFS);
    return p.buffer;
  }

  private ensureAudio(): void {
    if (this.context) return;
    this.context = new AudioContext();
    this.volume = this.context.createGain();
    this.volume.gain.value = 10 ** (this.volumeDb / 20);
    this.volume.connect(this.context.destination);
    this.player = new Player(this.context, this.volume);
  }

  private togglePlay(): void {
    if (this.playing) this.stop();
    else this.play();
  }

  private acceptCaution(): void {
    this.cautionAccepted = true;
    this.cautionShown = false;
    if (this.pendingPlay) this.play();
  }

  private play(): void {
    if (!this.cautionAccepted) {
      this.cautionShown = true;
      this.pendingPlay = true;
      return;
    }
    this.pendingPlay = false;
    this.problem = '';
    try {
      this.ensureAudio();
      void this.context!.resume();
      const buffer = this.bufferFor(this.selectedId);
      if (!buffer) {
        this.problem = 'This signal is silent: nothing to play.';
        return;
      }
      const loop = this.looping && this.loopRange ? { startSeconds: this.loopRange.startSeconds, endSeconds: Math.min(this.loopRange.endSeconds, buffer.duration) } : undefined;
      let offset = this.position >= buffer.duration - 0.01 ? 0 : this.position;
      if (loop && (offset < loop.startSeconds || offset >= loop.endSeconds)) offset = loop.startSeconds;
      this.player!.play(buffer, { offsetSeconds: offset, loop });
      this.playing = true;
      this.tick();
    } catch (error) {
      this.problem = `Cannot play: ${(error as Error).message}`;
    }
  }

  private stop(): void {
    cancelAnimationFrame(this.frame);
    if (this.player) {
      this.player.stop();
      this.position = this.player.currentPositionSeconds();
    }
    this.playing = false;
    this.dispatchEvent(new CustomEvent('playhead', { detail: null, bubbles: true, composed: true }));
  }

  private rewind(): void {
    const wasPlaying = this.playing;
    if (wasPlaying) this.stop();
    this.position = this.looping && this.loopRange ? this.loopRange.startSeconds : 0;
    if (wasPlaying) this.play();
  }

  private tick = (): void => {
    if (!this.player) return;
    this.position = this.player.currentPositionSeconds();
    if (!this.player.playing) {
      this.playing = false;
      this.dispatchEvent(new CustomEvent('playhead', { detail: null, bubbles: true, composed: true }));
      return;
    }
    this.dispatchEvent(new CustomEvent('playhead', { detail: this.position, bubbles: true, composed: true }));
    this.frame = requestAnimationFrame(this.tick);
  };

  private choose(id: string): void {
    this.selectedId = id;
    this.problem = '';
    if (!this.playing || !this.player) return;
    try {
      const buffer = this.bufferFor(id);
      if (buffer) this.player.switchTo(buffer);
      else this.stop();
    } catch (error) {
      // E.g. the loop reaches past the end of a shorter snapshot.
      this.stop();
      this.problem = `Cannot switch: ${(error as Error).message}`;
    }
  }

  private flipAb(): void {
    const ab = this.abPair;
    if (!ab) return;
    this.choose(this.selectedId === ab.b ? ab.a : ab.b);
  }

  private toggleLoop(event: Event): void {
    this.looping = (event.target as HTMLInputElement).checked;
    if (this.playing) {
      // The player takes a loop at the start: restart at the same position.
      this.position = this.player?.currentPositionSeconds() ?? this.position;
      this.play();
    }
  }

  private onVolume(event: Event): void {
    this.volumeDb = Math.min(0, Number((event.target as HTMLInputElement).value));
    if (this.volume) this.volume.gain.value = 10 ** (this.volumeDb / 20);
  }
}

declare global {
  interface HTMLElementTagNameMap {
    'gt-listen-bar': GtListenBar;
  }
}
