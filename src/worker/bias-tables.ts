/**
 * The DC operating points of both circuits exactly as the chain starts them
 * (chain.ts): the transmitter with the microphone's output resistance in
 * series and the microphone silent; the receiver lit by the LED's resting
 * light through the light path plus the mean ambient light and the dark
 * current, with the speaker load across its output.
 */
import type { Circuit, PhototransistorModel } from '../circuit/types.ts';
import { Diode } from '../devices/diode.ts';
import { InputError } from '../errors.ts';
import { withLightInputAndSpeaker, withMicrophoneResistance } from '../link/chain/rewire.ts';
import { channelGain } from '../link/light-path/light-path.ts';
import type { Scenario } from '../scenario/types.ts';
import { describeBias } from '../solver/bias-report.ts';
import { Simulator } from '../solver/simulator.ts';
import type { BiasTables } from './messages.ts';

/** Parts the chain adds to the circuits (names from rewire.ts). */
function addedPartRefs(scenario: Scenario): string[] {
  const refs = [`${scenario.transmitter.inputSource}#rout`];
  if (scenario.receiver.speakerOhms !== null) refs.push('SPEAKER#load');
  return refs;
}

export function biasTables(scenario: Scenario): BiasTables {
  const txCircuit = withMicrophoneResistance(scenario.transmitter.circuit, scenario.transmitter.inputSource, scenario.microphone.outputResistanceOhms);
  const tx = new Simulator(txCircuit, { method: scenario.method });
  const txMethod = tx.operatingPoint();
  const led = tx.system.devicesByRef.get(scenario.transmitter.led);
  if (!(led instanceof Diode) || !led.isLed) throw new InputError('transmitter.led', 'the ref of an LED in the transmitter circuit');
  const ledRestingAmperes = led.junctionCurrent(tx.x);

  const lp = scenario.lightPath;
  const restingDetectorWatts = channelGain(lp.channel) * led.opticalWatts(tx.x) + (lp.ambient?.meanPowerWatts ?? 0);
  const detectorPart = scenario.receiver.circuit.parts.find((p) => p.ref === scenario.receiver.detector);
  if (!detectorPart || detectorPart.kind !== 'phototransistor') {
    throw new InputError('receiver.detector', 'the ref of a phototransistor in the receiver circuit');
  }
  const responsivity = (detectorPart.model as PhototransistorModel).responsivity;
  // As in the chain: the dark current is carried as extra light on the detector.
  const restingLight = restingDetectorWatts + lp.darkCurrentAmperes / responsivity;
  const rewired = withLightInputAndSpeaker(scenario.receiver.circuit, scenario.receiver.detector, scenario.receiver.output, scenario.receiver.speakerOhms);
  const rxCircuit: Circuit = {
    ...rewired,
    parts: rewired.parts.map((part) => (part.ref === scenario.receiver.detector && part.kind === 'phototransistor' ? { ...part, light: { dc: restingLight } } : part)),
  };
  const rx = new Simulator(rxCircuit, { method: scenario.method });
  const rxMethod = rx.operatingPoint();
  return {
    transmitter: describeBias(tx, txMethod),
    receiver: describeBias(rx, rxMethod),
    ledRestingAmperes,
    restingDetectorWatts,
    addedParts: addedPartRefs(scenario),
  };
}
