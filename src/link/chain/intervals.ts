/** An interval of time, in seconds of the source recording. */
export interface TimeInterval {
  startSeconds: number;
  durationSeconds: number;
}

/** What a report says about one kind of episode (LED cut-off, saturation...): plain data. */
export interface Episodes {
  fraction: number;
  totalSeconds: number;
  count: number;
  /** The first MAX_LISTED_INTERVALS episodes, in source time. */
  intervals: TimeInterval[];
}

/** Intervals kept in a report at most; the count and total time go on beyond it. */
export const MAX_LISTED_INTERVALS = 2000;

/**
 * Collects the intervals during which a condition holds, sample by sample,
 * in constant memory past MAX_LISTED_INTERVALS.
 */
export class IntervalTracker {
  private startIndex = -1;
  private samplesInside = 0;
  private samplesSeen = 0;
  count = 0;
  readonly intervals: TimeInterval[] = [];

  constructor(
    private readonly samplePeriodSeconds: number,
    /** Source time of sample 0 (negative while the chain's filters fill). */
    private readonly offsetSeconds: number,
  ) {}

  /** Feeds sample `index` (counted from the start of the run). */
  update(index: number, inside: boolean): void {
    this.samplesSeen = index + 1;
    if (inside) {
      this.samplesInside++;
      if (this.startIndex < 0) this.startIndex = index;
    } else if (this.startIndex >= 0) {
      this.close(index);
    }
  }

  /** Ends any open interval at the end of the run. */
  finish(): void {
    if (this.startIndex >= 0) this.close(this.samplesSeen);
  }

  get fraction(): number {
    return this.samplesSeen > 0 ? this.samplesInside / this.samplesSeen : 0;
  }

  get totalSeconds(): number {
    return this.samplesInside * this.samplePeriodSeconds;
  }

  private close(endIndex: number): void {
    this.count++;
    if (this.intervals.length < MAX_LISTED_INTERVALS) {
      this.intervals.push({
        startSeconds: this.startIndex * this.samplePeriodSeconds + this.offsetSeconds,
        durationSeconds: (endIndex - this.startIndex) * this.samplePeriodSeconds,
      });
    }
    this.startIndex = -1;
  }
}

/** The tracker's findings as plain data (call after `finish`). */
export function toEpisodes(tracker: IntervalTracker): Episodes {
  return { fraction: tracker.fraction, totalSeconds: tracker.totalSeconds, count: tracker.count, intervals: tracker.intervals };
}
