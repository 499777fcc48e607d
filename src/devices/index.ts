import type { Part } from '../circuit/types.ts';
import { Bjt } from './bjt.ts';
import { Capacitor } from './capacitor.ts';
import type { Binder, Device } from './device.ts';
import { Diode } from './diode.ts';
import { Inductor } from './inductor.ts';
import { Resistor } from './resistor.ts';
import { CurrentSource, VoltageSource } from './sources.ts';

export type { Binder, Device, IterationContext, PinCurrents, ThreeTerminal, TwoTerminal } from './device.ts';
export { Bjt, Capacitor, CurrentSource, Diode, Inductor, Resistor, VoltageSource };

/** The device model for one parsed part. */
export function createDevice(part: Part, binder: Binder): Device {
  switch (part.kind) {
    case 'resistor':
      return Resistor.fromPins(part.ref, part.pins, part.value, binder);
    case 'capacitor':
      return Capacitor.fromPins(part.ref, part.pins, part.value, binder);
    case 'inductor':
      return new Inductor(part.ref, part.pins, part.value, binder);
    case 'voltage-source':
      return new VoltageSource(part.ref, part.pins, part, binder);
    case 'current-source':
      return new CurrentSource(part.ref, part.pins, part, binder);
    case 'diode':
    case 'led':
      return new Diode(part.ref, part.pins, part.model, binder);
    case 'npn':
    case 'pnp':
      return new Bjt(part.ref, part.kind, part.pins, part.model, binder);
    case 'phototransistor':
      return new Bjt(part.ref, 'phototransistor', part.pins, part.model, binder, part.light);
  }
}
