import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.ts';
import { runRenderJob, runAll, type RenderJob } from '../../src/worker/jobs.ts';
import { NodePool } from '../../src/worker/node-pool.ts';
import { linkScenario } from '../analysis/link-fixture.ts';

/** A job the chain refuses at once: the input names the supply, not an upstream-driven source. */
function badJob(): RenderJob {
  const scenario = linkScenario();
  return { scenario: { ...scenario, transmitter: { ...scenario.transmitter, inputSource: 'VCC' } }, metrics: ['cutoffFraction'] };
}

describe('NodePool', () => {
  it('hands the user\'s errors back as the same InputError a render in this thread throws', async () => {
    let here: unknown;
    try {
      runRenderJob(badJob());
    } catch (error) {
      here = error;
    }
    expect(here).toBeInstanceOf(InputError);
    const pool = new NodePool(1);
    try {
      const there = await pool.run(badJob()).catch((error: unknown) => error);
      expect(there).toBeInstanceOf(InputError);
      expect((there as Error).message).toBe((here as Error).message);
      // In a batch, such a job is one failed row, not the end of the batch.
      const outcomes = await runAll([badJob(), badJob()], pool);
      expect(outcomes).toEqual([
        { ok: false, error: (here as Error).message },
        { ok: false, error: (here as Error).message },
      ]);
    } finally {
      await pool.close();
    }
  });

  it('fails the jobs still waiting when it is closed, instead of leaving them pending', async () => {
    const pool = new NodePool(1);
    const jobs = [0, 1, 2].map(() => pool.run({ scenario: linkScenario(), metrics: ['cutoffFraction'] }).then(() => 'done', (error: Error) => error.message));
    await pool.close();
    expect(await Promise.all(jobs)).toEqual(Array(3).fill('the render pool was closed before this job finished'));
    await expect(pool.run(badJob())).rejects.toThrow(/closed/);
  });
});
