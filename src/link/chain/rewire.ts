import type { Circuit, Part } from '../../circuit/types.ts';
import { InputError } from '../../errors.ts';

/**
 * The transmitter as the chain runs it: the microphone's output resistance
 * goes in series with the source it drives (a new node `REF#emf` behind it).
 */
export function withMicrophoneResistance(circuit: Circuit, sourceRef: string, ohms: number): Circuit {
  if (!(ohms > 0)) return circuit;
  const parts: Part[] = [];
  for (const part of circuit.parts) {
    if (part.ref === sourceRef && part.kind === 'voltage-source') {
      const emf = `${sourceRef}#emf`;
      parts.push({ ...part, pins: [emf, part.pins[1]] });
      parts.push({ ref: `${sourceRef}#rout`, kind: 'resistor', pins: [emf, part.pins[0]], value: ohms });
    } else {
      parts.push(part);
    }
  }
  return { ...circuit, parts };
}

/**
 * The receiver as the chain runs it: the detector's light comes from the light
 * path sample by sample, and an optional speaker resistance sits across the output.
 */
export function withLightInputAndSpeaker(circuit: Circuit, detectorRef: string, output: [string, string], speakerOhms: number | null): Circuit {
  const parts: Part[] = circuit.parts.map((part) =>
    part.ref === detectorRef && part.kind === 'phototransistor' ? { ...part, light: { dc: 0, wave: { shape: 'upstream' } } } : part,
  );
  if (speakerOhms !== null) {
    if (circuit.parts.some((p) => p.ref === 'SPEAKER#load')) throw new InputError('receiver.circuit', 'no part named SPEAKER#load');
    parts.push({ ref: 'SPEAKER#load', kind: 'resistor', pins: [...output], value: speakerOhms });
  }
  return { ...circuit, parts };
}
