import type { Drive, Wave } from '../circuit/types.ts';

/**
 * A source's drive over time: dc + wave(t). An `upstream` wave reads the value
 * the signal chain last set, so a chain block can push one sample per step.
 */
export class DriveSignal {
  /** Set by the chain before each step when the wave is `upstream`. */
  upstreamValue = 0;
  private readonly dc: number;
  private readonly wave: Wave | undefined;
  private readonly pointTimes: Float64Array;
  private readonly pointValues: Float64Array;
  private cursor = 0;

  constructor(drive: Drive) {
    this.dc = drive.dc;
    this.wave = drive.wave;
    const points = drive.wave?.shape === 'points' ? drive.wave.points : [];
    this.pointTimes = Float64Array.from(points, (p) => p[0]);
    this.pointValues = Float64Array.from(points, (p) => p[1]);
  }

  /** The constant part of the drive. */
  get dcValue(): number {
    return this.dc;
  }

  /** A drive with no wave: its value never changes. */
  get isConstant(): boolean {
    return this.wave === undefined;
  }

  get isUpstream(): boolean {
    return this.wave?.shape === 'upstream';
  }

  valueAt(seconds: number): number {
    const w = this.wave;
    if (w === undefined) return this.dc;
    switch (w.shape) {
      case 'sine': {
        if (seconds < w.delaySeconds) return this.dc + w.amplitude * Math.sin((w.phaseDegrees * Math.PI) / 180);
        const phase = 2 * Math.PI * w.frequencyHertz * (seconds - w.delaySeconds) + (w.phaseDegrees * Math.PI) / 180;
        return this.dc + w.amplitude * Math.sin(phase);
      }
      case 'points':
        return this.dc + this.interpolate(seconds);
      case 'upstream':
        return this.dc + this.upstreamValue;
    }
  }

  /** Corners of the drive in (0, stopSeconds]: point times, the sine's start. */
  breakpoints(stopSeconds: number): number[] {
    const w = this.wave;
    if (w?.shape === 'points') return [...this.pointTimes].filter((t) => t > 0 && t <= stopSeconds);
    if (w?.shape === 'sine' && w.delaySeconds > 0 && w.delaySeconds <= stopSeconds) return [w.delaySeconds];
    return [];
  }

  private interpolate(seconds: number): number {
    const t = this.pointTimes;
    const v = this.pointValues;
    const n = t.length;
    if (seconds <= t[0]) return v[0];
    if (seconds >= t[n - 1]) return v[n - 1];
    // Time mostly moves forward: walk from the last position.
    let i = this.cursor;
    if (i >= n - 1 || t[i] > seconds) i = 0;
    while (t[i + 1] < seconds) i++;
    this.cursor = i;
    const fraction = (seconds - t[i]) / (t[i + 1] - t[i]);
    return v[i] + fraction * (v[i + 1] - v[i]);
  }
}
