import type { Scenario } from '../../scenario/types.ts';
import type { KernelBackend } from '../../solver/kernel/step-kernel.ts';
import { pascalsToDbSpl } from '../acoustics/sound-level.ts';
import type { Episodes } from './intervals.ts';
import type { CalibratedSource } from './source.ts';
import type { TransistorEpisodes } from './transistor-watch.ts';


export interface RenderReport {
  durationSeconds: number;
  sampleRateHertz: number;
  internalRateHertz: number;
  microphone: {
    targetDbSpl: number;
    levelMeasure: 'active-speech-level' | 'rms';
    activityFactor: number | null;
    /** Long-term rms level over the whole source, dB SPL. */
    longTermDbSpl: number;
    peakDbSpl: number;
  };
  led: {
    ref: string;
    restingAmperes: number;
    minimumAmperes: number;
    maximumAmperes: number;
    meanAmperes: number;
    cutoffThresholdAmperes: number;
    cutoff: Episodes;
  };
  light: { channelGain: number; restingDetectorWatts: number };
  transistors: Array<{ circuit: 'transmitter' | 'receiver'; ref: string; saturation: Episodes; cutoff: Episodes }>;
  farEnd: {
    rmsVolts: number;
    peakVolts: number;
    /** rms level in dB re 1 V. */
    rmsDbv: number;
    listeningGainDb: number;
    /** Speaker voltage that reaches full scale in the far-end WAV. */
    wavFullScaleVolts: number;
  };
  solver: {
    internalRateHertz: number;
    transmitterSteps: number;
    receiverSteps: number;
    newtonIterations: number;
    /** The same, circuit by circuit. */
    transmitterNewtonIterations: number;
    receiverNewtonIterations: number;
    subdividedSteps: number;
    /** Steps taken by the circuits' generated kernels (the rest took the general loop). */
    generatedSteps: number;
    /** Of those, steps solved on the previous step's linearisation and factors, circuit by circuit. */
    transmitterReusedSteps: number;
    receiverReusedSteps: number;
    /** What each circuit's generated kernel ran on: 'wasm', 'js', or null (none). */
    transmitterKernel: KernelBackend | null;
    receiverKernel: KernelBackend | null;
    wallSeconds: number;
    /** Time spent stepping each circuit (its statistics and taps included), seconds. */
    transmitterSeconds: number;
    receiverSeconds: number;
  };
}


export function buildReport(input: {
  scenario: Scenario;
  source: CalibratedSource;
  farEnd: { rmsVolts: number; peakVolts: number };
  restingLedAmperes: number;
  restingDetectorWatts: number;
  led: { minimum: number; maximum: number; mean: number; cutoff: Episodes };
  channelGain: number;
  transistors: TransistorEpisodes[];
  solver: RenderReport['solver'];
}): RenderReport {
  const { scenario, source, farEnd } = input;
  // From the source's own figures: a streamed source holds no samples.
  const sourceSquares = source.sumSquaresPascals;
  const sourcePeak = source.peakPascals;
  const n = Math.max(1, source.samples);
  const farRms = farEnd.rmsVolts;
  const farPeak = farEnd.peakVolts;
  const gain = scenario.output.listeningGainDb;
  return {
    durationSeconds: source.samples / scenario.sampleRateHertz,
    sampleRateHertz: scenario.sampleRateHertz,
    internalRateHertz: input.solver.internalRateHertz,
    microphone: {
      targetDbSpl: source.targetDbSpl,
      levelMeasure: source.levelMeasure,
      activityFactor: source.activityFactor,
      longTermDbSpl: pascalsToDbSpl(Math.sqrt(sourceSquares / n)),
      peakDbSpl: pascalsToDbSpl(sourcePeak),
    },
    led: {
      ref: scenario.transmitter.led,
      restingAmperes: input.restingLedAmperes,
      minimumAmperes: input.led.minimum,
      maximumAmperes: input.led.maximum,
      meanAmperes: input.led.mean,
      cutoffThresholdAmperes: scenario.transmitter.cutoffAmperes,
      cutoff: input.led.cutoff,
    },
    light: { channelGain: input.channelGain, restingDetectorWatts: input.restingDetectorWatts },
    transistors: input.transistors,
    farEnd: {
      rmsVolts: farRms,
      peakVolts: farPeak,
      rmsDbv: farRms > 0 ? 20 * Math.log10(farRms) : -Infinity,
      listeningGainDb: gain,
      wavFullScaleVolts: 10 ** (-gain / 20),
    },
    solver: input.solver,
  };
}
