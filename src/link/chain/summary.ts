import type { RenderReport } from './report.ts';

const ms = (seconds: number): string => `${(seconds * 1000).toFixed(1)} ms`;
// Leakage of a cut-off LED (pA, either sign) prints as 0.00, not -0.00.
const mA = (amperes: number): string => `${(Math.abs(amperes) < 5e-6 ? 0 : amperes * 1000).toFixed(2)} mA`;
const percent = (fraction: number): string => `${(fraction * 100).toFixed(fraction < 0.01 ? 2 : 1)} %`;

/** What happened in a render, in plain words (for the terminal and the page). */
export function summariseRender(report: RenderReport): string[] {
  const lines: string[] = [];
  const mic = report.microphone;
  lines.push(
    `Talker at the microphone: ${mic.targetDbSpl.toFixed(1)} dB SPL (${mic.levelMeasure === 'active-speech-level' ? 'active speech level' : 'rms'}), ` +
      `peaks ${mic.peakDbSpl.toFixed(1)} dB SPL, ${report.durationSeconds.toFixed(2)} s.`,
  );
  const led = report.led;
  lines.push(
    `LED ${led.ref}: rests at ${mA(led.restingAmperes)}, swung from ${mA(led.minimumAmperes)} to ${mA(led.maximumAmperes)} (mean ${mA(led.meanAmperes)}).`,
  );
  if (led.cutoff.count === 0) {
    lines.push(`The LED never cut off (threshold ${mA(led.cutoffThresholdAmperes)}): the light carried the whole waveform.`);
  } else {
    const longest = led.cutoff.intervals.reduce((a, b) => Math.max(a, b.durationSeconds), 0);
    const first = led.cutoff.intervals[0];
    lines.push(
      `The LED cut off ${led.cutoff.count} times, ${percent(led.cutoff.fraction)} of the time (${ms(led.cutoff.totalSeconds)} in all, longest ${ms(longest)}, ` +
        `first at ${first.startSeconds.toFixed(3)} s): those peaks are flattened at the far end.`,
    );
  }
  for (const t of report.transistors) {
    if (t.saturation.count > 0) lines.push(`${t.circuit} ${t.ref} saturated ${t.saturation.count} times (${percent(t.saturation.fraction)} of the time).`);
  }
  lines.push(`Light at the detector at rest: ${(report.light.restingDetectorWatts * 1e6).toFixed(2)} µW (path gain ${report.light.channelGain.toExponential(3)}).`);
  const far = report.farEnd;
  lines.push(
    `Far end: ${(far.rmsVolts * 1000).toFixed(1)} mV rms (${far.rmsDbv.toFixed(1)} dBV), peak ${(far.peakVolts * 1000).toFixed(1)} mV across the speaker; ` +
      `WAV full scale = ${far.wavFullScaleVolts.toPrecision(3)} V (listening gain ${far.listeningGainDb} dB).`,
  );
  const s = report.solver;
  const steps = s.transmitterSteps + s.receiverSteps;
  lines.push(
    `Solver: ${steps} steps (transmitter ${s.transmitterSteps}, receiver ${s.receiverSteps}; internal rate ${(s.internalRateHertz / 1000).toFixed(0)} kHz), ` +
      `${(s.newtonIterations / Math.max(1, steps)).toFixed(2)} Newton iterations per step ` +
      `(${percent((s.transmitterReusedSteps + s.receiverReusedSteps) / Math.max(1, steps))} of steps on the previous step's linearisation), ` +
      `${s.wallSeconds.toFixed(1)} s wall (${(report.durationSeconds / Math.max(1e-9, s.wallSeconds)).toFixed(2)}× real time).`,
  );
  return lines;
}
