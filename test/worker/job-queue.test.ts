import { describe, expect, it } from 'vitest';
import { JobQueue } from '../../src/worker/job-queue.ts';
import type { RenderJob, RenderJobResult } from '../../src/worker/jobs.ts';

const job = (n: number) => ({ n }) as unknown as RenderJob;
const result = (n: number) => ({ n }) as unknown as RenderJobResult;

describe('JobQueue', () => {
  it('hands jobs to free workers in order and settles each with its own reply', async () => {
    const sent: Array<[number, number]> = [];
    const queue = new JobQueue(2, (slot, id) => sent.push([slot, id]));
    const a = queue.run(job(0));
    const b = queue.run(job(1));
    const c = queue.run(job(2));
    expect(sent).toEqual([
      [0, 0],
      [1, 1],
    ]);
    queue.settle(1, 1, { ok: true, result: result(11) });
    expect(sent).toEqual([
      [0, 0],
      [1, 1],
      [1, 2],
    ]);
    queue.settle(0, 0, { ok: false, error: new Error('bad part') });
    queue.settle(1, 2, { ok: true, result: result(12) });
    await expect(a).rejects.toThrow('bad part');
    await expect(b).resolves.toEqual(result(11));
    await expect(c).resolves.toEqual(result(12));
  });

  it('ignores a reply for a job its worker does not hold', async () => {
    const queue = new JobQueue(1, () => {});
    const a = queue.run(job(0));
    queue.settle(0, 7, { ok: true, result: result(99) });
    queue.settle(0, 0, { ok: true, result: result(1) });
    await expect(a).resolves.toEqual(result(1));
  });

  it('fails the jobs running and waiting when stopped, and every later one, with the first reason', async () => {
    const queue = new JobQueue(1, () => {});
    const running = queue.run(job(0));
    const waiting = queue.run(job(1));
    queue.stop(new Error('worker died'));
    queue.stop(new Error('second reason'));
    await expect(running).rejects.toThrow('worker died');
    await expect(waiting).rejects.toThrow('worker died');
    await expect(queue.run(job(2))).rejects.toThrow('worker died');
  });
});
