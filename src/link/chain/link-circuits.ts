import type { PhototransistorModel } from '../../circuit/types.ts';
import { Bjt } from '../../devices/bjt.ts';
import { Diode } from '../../devices/diode.ts';
import type { DriveSignal } from '../../devices/wave.ts';
import { VoltageSource } from '../../devices/sources.ts';
import { InputError } from '../../errors.ts';
import type { Scenario } from '../../scenario/types.ts';
import { Simulator, type SimulatorOptions } from '../../solver/simulator.ts';
import { withLightInputAndSpeaker, withMicrophoneResistance } from './rewire.ts';

/** The two circuits of a link, with the parts the chain drives and reads. */
export interface LinkCircuits {
  transmitter: Simulator;
  receiver: Simulator;
  /** The source the microphone drives. */
  microphoneDrive: DriveSignal;
  led: Diode;
  detector: Bjt;
  /** The detector's light input. */
  lightDrive: DriveSignal;
  /** Base photocurrent per watt of the detector, A/W. */
  responsivity: number;
  /** Speaker node indices in the receiver (-1 = ground). */
  speakerPlus: number;
  speakerMinus: number;
}

/**
 * Builds both circuits as the chain runs them (microphone resistance in
 * series with the driven source; the detector lit from the light path; the
 * speaker load across the output) and finds the parts the chain talks to.
 */
export function buildLinkCircuits(scenario: Scenario, options: SimulatorOptions): LinkCircuits {
  const { transmitter: t, receiver: r } = scenario;
  const transmitter = new Simulator(withMicrophoneResistance(t.circuit, t.inputSource, scenario.microphone.outputResistanceOhms), options);
  const receiver = new Simulator(withLightInputAndSpeaker(r.circuit, r.detector, r.output, r.speakerOhms), options);
  const input = transmitter.system.devicesByRef.get(t.inputSource);
  if (!(input instanceof VoltageSource) || !input.drive.isUpstream) {
    throw new InputError('transmitter.input', 'the ref of a voltage source whose wave is {"shape": "upstream"}');
  }
  const led = transmitter.system.devicesByRef.get(t.led);
  if (!(led instanceof Diode) || !led.isLed) throw new InputError('transmitter.led', 'the ref of an LED in the transmitter circuit');
  const detector = receiver.system.devicesByRef.get(r.detector);
  if (!(detector instanceof Bjt) || !detector.light) throw new InputError('receiver.detector', 'the ref of a phototransistor in the receiver circuit');
  const detectorPart = r.circuit.parts.find((p) => p.ref === r.detector) as { model: PhototransistorModel };
  return {
    transmitter,
    receiver,
    microphoneDrive: input.drive,
    led,
    detector,
    lightDrive: detector.light,
    responsivity: detectorPart.model.responsivity,
    speakerPlus: receiver.system.nodeIndex(r.output[0]) ?? -1,
    speakerMinus: receiver.system.nodeIndex(r.output[1]) ?? -1,
  };
}
