import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseCircuitText } from '../../src/circuit/index.ts';
import type { Circuit, Part } from '../../src/circuit/types.ts';
import { VoltageSource } from '../../src/devices/sources.ts';
import { Bjt } from '../../src/devices/bjt.ts';
import type { DriveSignal } from '../../src/devices/wave.ts';
import { withLightInputAndSpeaker, withMicrophoneResistance } from '../../src/link/chain/rewire.ts';
import { AUDIO_TOLERANCES, DEFAULT_TOLERANCES, TIGHT_TOLERANCES, type NewtonTolerances } from '../../src/solver/newton.ts';
import { exponentialRemainderCode } from '../../src/solver/kernel/junction-code.ts';
import { ConstantPool } from '../../src/solver/kernel/literals.ts';
import { Simulator, type SimulatorOptions } from '../../src/solver/simulator.ts';

/*
 * The generated step kernel against the general step loop and against the
 * straightforward reference (dense elimination with partial pivoting, full
 * restamp every iteration; Golub & Van Loan, Matrix Computations, alg. 3.4.1)
 * on several circuits, quiet and loud, with hand-overs at hard spots.
 */

const root = new URL('../../', import.meta.url);
const circuitFile = (path: string): Circuit => parseCircuitText(readFileSync(new URL(path, root), 'utf8'), path);

/** The circuit with the source `ref`'s wave replaced by an upstream input. */
function withUpstream(circuit: Circuit, ref: string): Circuit {
  const parts = circuit.parts.map((p) => (p.ref === ref ? ({ ...p, dc: 0, wave: { shape: 'upstream' } } as Part) : p));
  return { ...circuit, parts };
}

interface Case {
  name: string;
  circuit: Circuit;
  input: (sim: Simulator) => DriveSignal;
  /** Input value at time t (seconds). */
  signal: (seconds: number) => number;
}

const source = (ref: string) => (sim: Simulator) => (sim.system.devicesByRef.get(ref) as VoltageSource).drive;
const light = (ref: string) => (sim: Simulator) => (sim.system.devicesByRef.get(ref) as Bjt).light as DriveSignal;
const tones = (volts: number) => (t: number) => volts * (Math.sin(2 * Math.PI * 440 * t) + 0.6 * Math.sin(2 * Math.PI * 1870 * t + 1) + 0.3 * Math.sin(2 * Math.PI * 5100 * t));

const CASES: Case[] = [
  {
    name: 'demo (a) transmitter, speech-level tones',
    circuit: withMicrophoneResistance(circuitFile('samples/demo-bay/transmitter.json'), 'VMIC', 2200),
    input: source('VMIC'),
    signal: tones(0.004),
  },
  {
    name: 'demo (a) transmitter, driven far past LED cut-off',
    circuit: withMicrophoneResistance(circuitFile('samples/demo-bay/transmitter.json'), 'VMIC', 2200),
    input: source('VMIC'),
    signal: tones(0.15),
  },
  {
    name: 'demo (a) receiver (phototransistor, PNP output, diodes), light swinging ±60 %',
    circuit: withLightInputAndSpeaker(circuitFile('samples/demo-bay/receiver.json'), 'Q1', ['spk', 'gnd'], null),
    input: light('Q1'),
    signal: (t) => 207e-6 * (1 + 0.6 * Math.sin(2 * Math.PI * 700 * t) * Math.sin(2 * Math.PI * 23 * t)),
  },
  {
    name: 'demo (b) transmitter',
    circuit: withMicrophoneResistance(circuitFile('samples/demo-workshop/transmitter.json'), 'VMIC', 2200),
    input: source('VMIC'),
    signal: tones(0.02),
  },
  {
    name: 'common-emitter sample with an abrupt 2 V step (a hard spot the kernel hands over)',
    circuit: withUpstream(circuitFile('samples/circuits/common-emitter-9v.json'), 'VIN'),
    input: source('VIN'),
    signal: (t) => (t > 2e-3 ? 2 : 0) + 0.01 * Math.sin(2 * Math.PI * 1000 * t),
  },
];

const STEP_SECONDS = 1 / 192_000;
/** The audio tolerances with every step freshly linearised: what the general loop does. */
const FRESH: NewtonTolerances = { ...AUDIO_TOLERANCES, reuseAcceptance: 0 };

function run(c: Case, steps: number, options: SimulatorOptions): { solutions: Float64Array; sim: Simulator } {
  const sim = new Simulator(c.circuit, { tolerances: FRESH, ...options });
  const drive = c.input(sim);
  sim.operatingPoint();
  const inputs = Float64Array.from({ length: steps }, (_, i) => c.signal((i + 1) * STEP_SECONDS));
  const solutions = new Float64Array(steps * sim.system.size);
  for (let from = 0; from < steps; from += 1000) sim.runBlock(STEP_SECONDS, drive, inputs, from, Math.min(steps, from + 1000), 1, solutions);
  return { solutions, sim };
}

/** Largest difference relative to max(1 V or 1 A scale, |reference|) over all unknowns and steps. */
function worstDifference(a: Float64Array, b: Float64Array, scale: number): number {
  let worst = 0;
  for (let i = 0; i < a.length; i++) worst = Math.max(worst, Math.abs(a[i] - b[i]) / Math.max(scale, Math.abs(b[i])));
  return worst;
}

describe('generated step kernel', () => {
  for (const c of CASES) {
    it(`${c.name}: same steps and Newton iterations as the general loop, same solutions within 1e-9, the dense reference within 1e-6`, () => {
      const steps = 4000;
      const kernel = run(c, steps, {});
      const general = run(c, steps, { generatedSteps: false });
      const dense = run(c, steps, { linearAlgebra: 'dense' });
      expect(kernel.sim.kernel).not.toBeNull();
      expect(kernel.sim.generatedSteps).toBeGreaterThan(0.9 * steps);
      expect(general.sim.generatedSteps).toBe(0);
      expect(dense.sim.generatedSteps).toBe(0);
      expect(kernel.sim.newton.totalIterations).toBe(general.sim.newton.totalIterations);
      expect(worstDifference(kernel.solutions, general.solutions, 1)).toBeLessThan(1e-9);
      expect(worstDifference(kernel.solutions, dense.solutions, 1)).toBeLessThan(1e-6);
      expect(kernel.solutions.every(Number.isFinite)).toBe(true);
    });

    it(`${c.name}, holding linearisations: the same steps held, the same Newton iterations and solutions within 1e-9 as the general loop`, () => {
      const steps = 4000;
      const kernel = run(c, steps, { tolerances: AUDIO_TOLERANCES });
      const general = run(c, steps, { tolerances: AUDIO_TOLERANCES, generatedSteps: false });
      expect(kernel.sim.generatedSteps).toBeGreaterThan(0.9 * steps);
      expect(kernel.sim.reusedSteps).toBeGreaterThan(0);
      // Each hand-over between the loops costs one fresh linearisation the general loop alone would have held.
      const handOvers = steps - kernel.sim.generatedSteps - 1;
      expect(Math.abs(kernel.sim.reusedSteps - general.sim.reusedSteps)).toBeLessThanOrEqual(handOvers);
      expect(Math.abs(kernel.sim.newton.totalIterations - general.sim.newton.totalIterations)).toBeLessThanOrEqual(5 * handOvers);
      expect(worstDifference(kernel.solutions, general.solutions, 1)).toBeLessThan(handOvers > 0 ? 1e-6 : 1e-9);
    });
  }

  for (const c of CASES) {
    it(`${c.name}: the WebAssembly translation takes the JavaScript kernel's steps to the bit (same solutions, iterations, held steps, hand-overs)`, () => {
      const steps = 4000;
      const wasm = run(c, steps, { tolerances: AUDIO_TOLERANCES, kernelBackend: 'wasm' });
      const js = run(c, steps, { tolerances: AUDIO_TOLERANCES, kernelBackend: 'js' });
      expect(wasm.sim.kernel?.backend).toBe('wasm');
      expect(js.sim.kernel?.backend).toBe('js');
      expect(wasm.sim.generatedSteps).toBe(js.sim.generatedSteps);
      expect(wasm.sim.reusedSteps).toBe(js.sim.reusedSteps);
      expect(wasm.sim.newton.totalIterations).toBe(js.sim.newton.totalIterations);
      let differing = 0;
      for (let i = 0; i < js.solutions.length; i++) if (!Object.is(wasm.solutions[i], js.solutions[i])) differing++;
      expect(differing).toBe(0);
    });
  }

  it('runs the JavaScript kernel where the engine has no WebAssembly, with the same solutions', () => {
    const c = CASES[2];
    const wasm = run(c, 2000, { tolerances: AUDIO_TOLERANCES });
    const saved = globalThis.WebAssembly;
    let js: ReturnType<typeof run>;
    try {
      (globalThis as { WebAssembly?: unknown }).WebAssembly = undefined;
      js = run(c, 2000, { tolerances: AUDIO_TOLERANCES });
    } finally {
      globalThis.WebAssembly = saved;
    }
    expect(wasm.sim.kernel?.backend).toBe('wasm');
    expect(js.sim.kernel?.backend).toBe('js');
    expect(js.sim.generatedSteps).toBe(wasm.sim.generatedSteps);
    expect(Array.from(js.solutions).every((v, i) => Object.is(v, wasm.solutions[i]))).toBe(true);
  });

  it('hands the hard spot over to the general loop and takes the steps after it again', () => {
    const c = CASES[4];
    const { sim } = run(c, 4000, {});
    expect(sim.generatedSteps).toBeLessThan(4000);
    expect(sim.generatedSteps).toBeGreaterThan(3900);
  });

  it('keeps a circuit with a part it does not generate (an inductor) on the general loop, with the same answer', () => {
    const base = withUpstream(circuitFile('samples/circuits/rc-low-pass.json'), 'VIN');
    const circuit: Circuit = {
      ...base,
      parts: base.parts.map((p) => (p.kind === 'resistor' ? { ...p } : p)).concat([{ ref: 'L9', kind: 'inductor', pins: ['out', 'gnd'], value: 0.1 } as Part]),
    };
    const c: Case = { name: 'rc with inductor', circuit, input: source('VIN'), signal: tones(1) };
    const kernel = run(c, 500, {});
    const general = run(c, 500, { generatedSteps: false });
    expect(kernel.sim.kernel).toBeNull();
    expect(kernel.sim.generatedSteps).toBe(0);
    expect(worstDifference(kernel.solutions, general.solutions, 1)).toBe(0);
  });

  it('builds its code from numbers only: refs and node names written as code never reach it', () => {
    const hostile = '");globalThis.__kernelInjected=1;("';
    const text = readFileSync(new URL('samples/circuits/common-emitter-9v.json', root), 'utf8').replaceAll('"collector"', JSON.stringify(`collector${hostile}`)).replaceAll('"Q1"', JSON.stringify(`Q1${hostile}`));
    const circuit = withUpstream(parseCircuitText(text, 'hostile.json'), 'VIN');
    const c: Case = { name: 'hostile names', circuit, input: source('VIN'), signal: tones(0.01) };
    const { sim } = run(c, 200, {});
    const code = sim.kernel?.code ?? '';
    expect(code.length).toBeGreaterThan(1000);
    expect(code).not.toContain('__kernelInjected');
    expect(code).not.toContain('collector');
    expect((globalThis as { __kernelInjected?: number }).__kernelInjected).toBeUndefined();
  });

  it('follows the tolerances it is given: tight tolerances take more iterations than the audio ones', () => {
    const c = CASES[0];
    const audio = run(c, 1000, {});
    const tight: NewtonTolerances = { ...DEFAULT_TOLERANCES, quadraticAcceptance: 0 };
    const strict = run(c, 1000, { tolerances: tight });
    expect(strict.sim.newton.totalIterations).toBeGreaterThan(audio.sim.newton.totalIterations);
    // Audio tolerances stop at 1e-4 relative junction-current error (newton.ts); every unknown stays within 1e-4 V or A of tight.
    expect(worstDifference(audio.solutions, strict.solutions, 1)).toBeLessThan(1e-4);
  });
});

describe('generated step kernel on a held linearisation (AUDIO_TOLERANCES.reuseAcceptance)', () => {
  const steps = 4000;
  for (const c of CASES) {
    it(`${c.name}: no further from the tight general loop than fresh linearisation is, give or take 10 %`, () => {
      const tight = run(c, steps, { tolerances: TIGHT_TOLERANCES, generatedSteps: false });
      const fresh = run(c, steps, {});
      const held = run(c, steps, { tolerances: AUDIO_TOLERANCES });
      expect(held.sim.reusedSteps).toBeGreaterThan(0);
      expect(fresh.sim.reusedSteps).toBe(0);
      const freshError = worstDifference(fresh.solutions, tight.solutions, 1);
      expect(worstDifference(held.solutions, tight.solutions, 1)).toBeLessThanOrEqual(1.1 * freshError + 1e-7);
      expect(held.solutions.every(Number.isFinite)).toBe(true);
    });
  }

  it('takes quiet steps without evaluating a junction, and its chord correction is what keeps them close to fresh linearisation', () => {
    const c = CASES[0];
    const fresh = run(c, steps, {});
    const held = run(c, steps, { tolerances: AUDIO_TOLERANCES });
    const uncorrected = run(c, steps, { tolerances: { ...AUDIO_TOLERANCES, reuseCorrection: false } });
    expect(held.sim.reusedSteps).toBeGreaterThan(0.15 * steps);
    expect(held.sim.newton.totalIterations).toBeLessThan(0.85 * steps);
    // Without the chord step the tangent's error (up to ½x² = 3e-5 of a junction current) shows: some 40× larger here.
    const heldDifference = worstDifference(held.solutions, fresh.solutions, 1);
    expect(worstDifference(uncorrected.solutions, fresh.solutions, 1)).toBeGreaterThan(10 * heldDifference);
  });

  it('sums the exponential beyond its tangent, e^x − 1 − x, within its Taylor remainder x⁶/720 for |x| ≤ 0.05 (against Math.expm1; A&S 4.2.1)', () => {
    const pool = new ConstantPool();
    const remainder = new Function('k', 'x', `return ${exponentialRemainderCode(pool, 'x')};`) as (k: Float64Array, x: number) => number;
    const k = Float64Array.from(pool.values);
    for (let x = -0.05; x <= 0.05; x += 0.0007) {
      const exact = Math.expm1(x) - x;
      expect(Math.abs(remainder(k, x) - exact)).toBeLessThanOrEqual(1.1 * (x ** 6 / 720) + 1e-18);
    }
  });

  it('drops a held linearisation when the other loop has stepped in between (its factors belong to older junction voltages)', () => {
    const c = CASES[0];
    const sim = new Simulator(c.circuit, { tolerances: AUDIO_TOLERANCES });
    const drive = c.input(sim);
    sim.operatingPoint();
    // Silence at the operating point: every step after the first can hold its linearisation.
    const inputs = new Float64Array(4000);
    const solutions = new Float64Array(4000 * sim.system.size);
    sim.runBlock(STEP_SECONDS, drive, inputs, 0, 3000, 1, solutions);
    const reused = sim.reusedSteps;
    expect(reused).toBeGreaterThan(2900);
    const general = (i: number): void => {
      drive.upstreamValue = inputs[i];
      sim.step(STEP_SECONDS, (i + 1) * STEP_SECONDS);
    };
    // The general loop's first step after the kernel's is linearised afresh, its second holds.
    general(3000);
    expect(sim.reusedSteps).toBe(reused);
    general(3001);
    expect(sim.reusedSteps).toBe(reused + 1);
    // And the kernel's first step after the general loop's.
    sim.runBlock(STEP_SECONDS, drive, inputs, 3002, 3003, 1, solutions);
    expect(sim.reusedSteps).toBe(reused + 1);
    sim.runBlock(STEP_SECONDS, drive, inputs, 3003, 3004, 1, solutions);
    expect(sim.reusedSteps).toBe(reused + 2);
  });
});
