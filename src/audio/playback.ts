/**
 * Playback through the Web Audio API, for the page and for Node alike: only the context
 * handed in is used (a browser AudioContext, or web-audio-api's contexts in Node), nothing
 * else from the DOM. Everything played goes through `toAudioBuffer`, which applies the
 * user's gain and then the safe-level limiter, so no setting can blast the listener.
 */
import { InputError } from '../errors.ts';
import { limitPeaks, type LimiterOptions } from './limiter.ts';

/** Seconds of crossfade when switching buffers: short enough to keep the position, long enough not to click (common practice, no source). */
export const SWITCH_CROSSFADE_SECONDS = 0.01;
/** How far ahead of `currentTime` a switch is scheduled on a running context, so it is not already in the past when the audio thread sees it (common practice, no source). */
export const SCHEDULING_LEAD_SECONDS = 0.03;

/**
 * Mono AudioBuffer of `samples` × 10^(gainDb/20), limited to the ceiling (default −6 dBFS).
 * The buffer keeps the recording's rate; the context resamples on playback.
 */
export function toAudioBuffer(
  context: BaseAudioContext,
  samples: Float64Array,
  sampleRateHertz: number,
  gainDb: number,
  limiter: LimiterOptions = {},
): AudioBuffer {
  if (!Number.isFinite(gainDb) || gainDb > 60 || gainDb < -120) {
    throw new InputError('gainDb', 'a gain from −120 to +60 dB', `got ${gainDb}`);
  }
  if (samples.length === 0) throw new InputError('samples', 'at least one sample to play', 'got none');
  if (!(Number.isFinite(sampleRateHertz) && sampleRateHertz > 0)) {
    throw new InputError('sampleRateHertz', 'a positive number of hertz', `got ${sampleRateHertz}`);
  }
  const gain = 10 ** (gainDb / 20);
  const scaled = new Float32Array(samples.length);
  for (let i = 0; i < samples.length; i++) scaled[i] = samples[i] * gain;
  const { output } = limitPeaks(scaled, sampleRateHertz, limiter);
  let buffer: AudioBuffer;
  try {
    buffer = context.createBuffer(1, output.length, sampleRateHertz);
  } catch (error) {
    throw new InputError('sampleRateHertz', 'a rate this audio context can play (Web Audio: 3000 to 768000 Hz)', `got ${sampleRateHertz}: ${(error as Error).message}`);
  }
  buffer.copyToChannel(output, 0);
  return buffer;
}

export interface LoopSeconds {
  startSeconds: number;
  endSeconds: number;
}

export interface PlayOptions {
  /** Where in the buffer to start. Default 0. */
  offsetSeconds?: number;
  /** Repeat this stretch of the buffer. */
  loop?: LoopSeconds;
  /** Context time to start at. Default: now (offline contexts) or now + SCHEDULING_LEAD_SECONDS. */
  atContextSeconds?: number;
}

interface Voice {
  source: AudioBufferSourceNode;
  fader: GainNode;
}

/**
 * Plays one buffer at a time and switches between buffers (A/B listening) at the same
 * position. Position is kept as an anchor: buffer time `anchorOffset` at context time
 * `anchorTime`, advancing 1 s per s and wrapping inside the loop; a switch keeps the anchor.
 */
export class Player {
  private voice: Voice | null = null;
  private buffer: AudioBuffer | null = null;
  private loop: LoopSeconds | null = null;
  private anchorTime = 0;
  private anchorOffset = 0;
  private stoppedAt = 0;

  constructor(
    private readonly context: BaseAudioContext,
    private readonly destination: AudioNode = context.destination,
  ) {}

  get playing(): boolean {
    return this.voice !== null && !this.ended();
  }

  play(buffer: AudioBuffer, options: PlayOptions = {}): void {
    const offsetSeconds = options.offsetSeconds ?? 0;
    if (!(Number.isFinite(offsetSeconds) && offsetSeconds >= 0 && offsetSeconds < buffer.duration)) {
      throw new InputError('offsetSeconds', `a start from 0 to below ${buffer.duration} s (the buffer's length)`, `got ${offsetSeconds}`);
    }
    const loop = options.loop ?? null;
    if (loop) checkLoop(loop, buffer.duration);
    this.stop();
    const when = options.atContextSeconds ?? this.now();
    this.buffer = buffer;
    this.loop = loop;
    this.anchorTime = when;
    this.anchorOffset = offsetSeconds;
    this.voice = this.startVoice(buffer, when, this.positionAt(when), 1);
  }

  /** Continue with `other` from the same position: new source at the same context time, crossfaded. */
  switchTo(other: AudioBuffer, atContextSeconds?: number): void {
    if (!this.voice || !this.buffer) {
      this.buffer = other;
      return;
    }
    if (this.loop) checkLoop(this.loop, other.duration);
    const when = Math.max(atContextSeconds ?? this.now(), this.context.currentTime);
    const position = this.positionAt(when);
    const old = this.voice;
    this.buffer = other;
    if (position >= other.duration) {
      this.stop(when);
      return;
    }
    const fadeEnd = when + SWITCH_CROSSFADE_SECONDS;
    old.fader.gain.cancelScheduledValues(when);
    old.fader.gain.setValueAtTime(1, when);
    old.fader.gain.linearRampToValueAtTime(0, fadeEnd);
    old.source.stop(fadeEnd);
    this.voice = this.startVoice(other, when, position, 0);
    this.voice.fader.gain.setValueAtTime(0, when);
    this.voice.fader.gain.linearRampToValueAtTime(1, fadeEnd);
  }

  /** Stop now (or at a context time); the position is kept for `currentPositionSeconds`. */
  stop(atContextSeconds?: number): void {
    if (!this.voice) return;
    const when = atContextSeconds ?? this.context.currentTime;
    this.stoppedAt = this.positionAt(when);
    this.voice.source.stop(when);
    this.voice = null;
  }

  /** Position in the buffer now, seconds (the stop position once stopped). */
  currentPositionSeconds(): number {
    return this.voice ? this.positionAt(this.context.currentTime) : this.stoppedAt;
  }

  private now(): number {
    // An offline context is not running before rendering: "now" is exactly its currentTime.
    const running = this.context.state === 'running' && !isOffline(this.context);
    return this.context.currentTime + (running ? SCHEDULING_LEAD_SECONDS : 0);
  }

  private ended(): boolean {
    return !this.loop && this.buffer !== null && this.positionAt(this.context.currentTime) >= this.buffer.duration;
  }

  /** Buffer position at a context time (before a scheduled start: the start offset). */
  private positionAt(contextSeconds: number): number {
    const unwrapped = this.anchorOffset + Math.max(0, contextSeconds - this.anchorTime);
    const loop = this.loop;
    if (loop && unwrapped >= loop.endSeconds) {
      const length = loop.endSeconds - loop.startSeconds;
      return loop.startSeconds + ((unwrapped - loop.endSeconds) % length);
    }
    return this.buffer ? Math.min(unwrapped, this.buffer.duration) : unwrapped;
  }

  private startVoice(buffer: AudioBuffer, when: number, offsetSeconds: number, gain: number): Voice {
    const source = this.context.createBufferSource();
    source.buffer = buffer;
    if (this.loop) {
      source.loop = true;
      source.loopStart = this.loop.startSeconds;
      source.loopEnd = this.loop.endSeconds;
    }
    const fader = this.context.createGain();
    fader.gain.value = gain;
    source.connect(fader);
    fader.connect(this.destination);
    source.start(when, offsetSeconds);
    source.onended = () => {
      fader.disconnect();
    };
    return { source, fader };
  }
}

function checkLoop(loop: LoopSeconds, durationSeconds: number): void {
  const { startSeconds, endSeconds } = loop;
  if (!(Number.isFinite(startSeconds) && Number.isFinite(endSeconds) && startSeconds >= 0 && endSeconds > startSeconds && endSeconds <= durationSeconds)) {
    throw new InputError('loop', `0 ≤ startSeconds < endSeconds ≤ ${durationSeconds} s (the buffer's length)`, `got ${startSeconds}…${endSeconds}`);
  }
}

function isOffline(context: BaseAudioContext): boolean {
  return 'startRendering' in context;
}
