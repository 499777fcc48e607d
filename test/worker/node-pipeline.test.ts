import { describe, expect, it } from 'vitest';
import { renderScenario } from '../../src/link/chain/chain.ts';
import { renderPipelined } from '../../src/worker/node-pipeline.ts';
import { InputError } from '../../src/errors.ts';
import { linkScenario } from '../analysis/link-fixture.ts';

const withoutTimes = (report: ReturnType<typeof renderScenario>['report']) => ({
  ...report,
  solver: { ...report.solver, wallSeconds: 0, transmitterSeconds: 0, receiverSeconds: 0 },
});

describe('renderPipelined', () => {
  it('gives, with the transmitter on a worker thread, exactly the render of renderScenario', async () => {
    const scenario = linkScenario({ kind: 'speech-like', seconds: 0.25, level: { dbSpl: 112 } });
    const taps = ['transmitter.led', 'light.detectorWatts', 'receiver.pc', 'speaker.volts'];
    const one = renderScenario(scenario, { taps });
    const two = await renderPipelined(scenario, { taps });
    expect(two.farEndVolts).toEqual(one.farEndVolts);
    expect(two.sourcePascals).toEqual(one.sourcePascals);
    expect(two.taps.map((t) => t.name)).toEqual(one.taps.map((t) => t.name));
    for (let i = 0; i < one.taps.length; i++) expect(two.taps[i].samples).toEqual(one.taps[i].samples);
    expect(withoutTimes(two.report)).toEqual(withoutTimes(one.report));
    expect(one.report.led.cutoff.count).toBeGreaterThan(0); // the check covers the interval lists too
  });

  it('passes a user error from the worker thread back as an InputError', async () => {
    const scenario = linkScenario();
    await expect(renderPipelined(scenario, { taps: ['transmitter.nowhere'] })).rejects.toBeInstanceOf(InputError);
  });
});
