import type { DriveSignal } from '../../devices/wave.ts';

/**
 * What a device tells the step-kernel generator about itself: its topology as
 * unknown indices (-1 = ground), its parameters as plain numbers, and how to
 * read and write the state it carries between steps. Linear conductances need
 * no part: they are already in the system's constant matrix.
 */
export type KernelPart = CapacitorPart | VoltageSourcePart | DiodePart | BjtPart;

/** State a part carries between steps, copied in and out around a kernel run (without allocating). */
export interface KernelState {
  read(into: KernelArray, at: number): void;
  write(from: Readonly<KernelArray>, at: number): void;
}

/** A kernel's state array: plain doubles for the JavaScript kernel, a view of its memory for the WebAssembly one. */
export type KernelArray = number[] | Float64Array;

/** A linear capacitor; its state is [charge s₁, charge s₂, current d₁]. */
export interface CapacitorPart {
  kind: 'capacitor';
  a: number;
  b: number;
  farads: number;
  state: KernelState;
}

/** An ideal voltage source: its branch row's right-hand side is the drive. */
export interface VoltageSourcePart {
  kind: 'voltage-source';
  branch: number;
  drive: DriveSignal;
}

export interface JunctionParameters {
  saturationAmperes: number;
  /** n·VT, volts. */
  emissionVolts: number;
  /** Voltage above which Newton steps are limited. */
  criticalVolts: number;
}

/** A junction diode (series resistance and capacitance given separately); state [junction volts]. */
export interface DiodePart extends JunctionParameters {
  kind: 'diode';
  /** The junction's p side (behind any series resistance) and its cathode. */
  junction: number;
  cathode: number;
  state: KernelState;
}

/** The transport-form transistor of `Bjt`; state [vbe, vbc, photocurrent]. */
export interface BjtPart extends JunctionParameters {
  kind: 'bjt';
  collector: number;
  base: number;
  emitter: number;
  /** +1 NPN, −1 PNP. */
  polarity: number;
  inverseForwardBeta: number;
  inverseReverseBeta: number;
  inverseEarlyVolts: number;
  /** Phototransistor: the light drive in watts and amperes per watt (else null and 0). */
  light: DriveSignal | null;
  responsivity: number;
  state: KernelState;
}
