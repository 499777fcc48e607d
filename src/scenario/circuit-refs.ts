/**
 * Checks that a scenario's part refs and nodes fit its circuits: the
 * transmitter's input is a voltage source driven from upstream, its led an
 * LED, the receiver's detector a phototransistor, the output nodes exist.
 * Exactly one drive per circuit is fed by the chain, so any other
 * `{"shape": "upstream"}` wave is an error at the part that carries it.
 */
import type { Circuit, Part, PartKind } from '../circuit/types.ts';
import { InputError } from '../errors.ts';
import type { At } from '../circuit/issues.ts';

const KIND_NAMES: Record<PartKind, string> = {
  resistor: 'a resistor',
  capacitor: 'a capacitor',
  inductor: 'an inductor',
  'voltage-source': 'a voltage source',
  'current-source': 'a current source',
  diode: 'a diode',
  led: 'an LED',
  npn: 'an NPN transistor',
  pnp: 'a PNP transistor',
  phototransistor: 'a phototransistor',
};

/** "(candidates: D1, D2)" or "(the circuit has none)". */
function candidates(circuit: Circuit, fits: (part: Part) => boolean): string {
  const refs = circuit.parts.filter(fits).map((part) => part.ref);
  return refs.length === 0 ? '(the circuit has none)' : `(candidates: ${refs.join(', ')})`;
}

function findPart(circuit: Circuit, ref: string, where: string, wanted: string, fits: (part: Part) => boolean, block: string): Part {
  const part = circuit.parts.find((p) => p.ref === ref);
  if (!part) throw new InputError(where, `the ref of ${wanted} in the ${block} circuit ${candidates(circuit, fits)}`, `no part "${ref}"`);
  return part;
}

const isUpstreamSource = (part: Part): boolean =>
  part.kind === 'voltage-source' && part.wave?.shape === 'upstream';

/** Paths (within the circuit) of every drive whose wave is upstream. */
function upstreamDrives(circuit: Circuit): Array<{ index: number; ref: string; segments: PropertyKey[] }> {
  const found: Array<{ index: number; ref: string; segments: PropertyKey[] }> = [];
  circuit.parts.forEach((part, index) => {
    if ((part.kind === 'voltage-source' || part.kind === 'current-source') && part.wave?.shape === 'upstream') {
      found.push({ index, ref: part.ref, segments: ['parts', index, 'wave'] });
    }
    if (part.kind === 'phototransistor' && part.light.wave?.shape === 'upstream') {
      found.push({ index, ref: part.ref, segments: ['parts', index, 'light', 'wave'] });
    }
  });
  return found;
}

export function checkTransmitter(circuit: Circuit, circuitAt: At, inputRef: string, ledRef: string, at: At): void {
  const inputWhere = at('transmitter', 'input');
  const wanted = 'a voltage source whose wave is {"shape": "upstream"}';
  const input = findPart(circuit, inputRef, inputWhere, wanted, isUpstreamSource, 'transmitter');
  if (input.kind !== 'voltage-source') {
    throw new InputError(inputWhere, `${wanted}, which the microphone drives ${candidates(circuit, isUpstreamSource)}`, `"${inputRef}" is ${KIND_NAMES[input.kind]}`);
  }
  if (input.wave?.shape !== 'upstream') {
    const has = input.wave ? `a "${input.wave.shape}" wave` : 'no wave';
    throw new InputError(inputWhere, `${wanted}, which the microphone drives: give "${inputRef}" "wave": {"shape": "upstream"}`, `"${inputRef}" has ${has}`);
  }

  const ledWhere = at('transmitter', 'led');
  const isLed = (part: Part) => part.kind === 'led';
  const led = findPart(circuit, ledRef, ledWhere, 'an LED', isLed, 'transmitter');
  if (led.kind !== 'led') throw new InputError(ledWhere, `the ref of an LED ${candidates(circuit, isLed)}`, `"${ledRef}" is ${KIND_NAMES[led.kind]}`);

  for (const drive of upstreamDrives(circuit)) {
    if (drive.ref === inputRef) continue;
    throw new InputError(
      circuitAt(...drive.segments),
      `no upstream wave except on transmitter.input ("${inputRef}"): the chain drives only that source`,
      `"${drive.ref}" is also upstream`,
    );
  }
}

export function checkReceiver(circuit: Circuit, circuitAt: At, detectorRef: string, output: readonly [string, string], at: At): void {
  const detectorWhere = at('receiver', 'detector');
  const isPhototransistor = (part: Part) => part.kind === 'phototransistor';
  const detector = findPart(circuit, detectorRef, detectorWhere, 'a phototransistor', isPhototransistor, 'receiver');
  if (detector.kind !== 'phototransistor') {
    throw new InputError(detectorWhere, `the ref of a phototransistor ${candidates(circuit, isPhototransistor)}`, `"${detectorRef}" is ${KIND_NAMES[detector.kind]}`);
  }

  const nodes = new Set(circuit.parts.flatMap((part) => part.pins));
  output.forEach((node, index) => {
    if (!nodes.has(node)) {
      const shown = [...nodes].slice(0, 20).join(', ');
      throw new InputError(at('receiver', 'output', index), `a node of the receiver circuit (${shown}${nodes.size > 20 ? ', …' : ''})`, `no node "${node}"`);
    }
  });
  if (output[0] === output[1]) throw new InputError(at('receiver', 'output', 1), 'a node other than output[0]', `both are "${output[1]}"`);

  for (const drive of upstreamDrives(circuit)) {
    if (drive.ref === detectorRef) continue;
    throw new InputError(
      circuitAt(...drive.segments),
      `no upstream wave in the receiver except on the detector's light ("${detectorRef}"): the chain feeds only the light path`,
      `"${drive.ref}" is upstream`,
    );
  }
}
