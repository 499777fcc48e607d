/// <reference lib="webworker" />
/**
 * The render worker: one RenderRequest at a time, replies as in messages.ts;
 * it also runs analysis jobs (JobRequest, for the Margins tab) one at a time.
 * Started by the page with
 *   new Worker(new URL('../../src/worker/render-worker.ts', import.meta.url), { type: 'module' })
 * and terminated to cancel.
 */
import { isUserFacing } from '../errors.ts';
import { errorToData, runRenderJob as runAnalysisJob } from './jobs.ts';
import { transferables, type JobReply, type JobRequest, type RenderRequest, type WorkerReply } from './messages.ts';
import { runRenderJob } from './render-job.ts';

const scope = self as unknown as DedicatedWorkerGlobalScope;

function reply(message: WorkerReply, transfer: Transferable[] = []): void {
  scope.postMessage(message, transfer);
}

function runJob(request: JobRequest): void {
  let answer: JobReply;
  try {
    answer = { kind: 'job-done', id: request.id, result: runAnalysisJob(request.job) };
  } catch (error) {
    answer = { kind: 'job-failed', id: request.id, error: errorToData(error) };
  }
  scope.postMessage(answer);
}

scope.onmessage = (event: MessageEvent<RenderRequest | JobRequest>) => {
  const request = event.data;
  if (request?.kind === 'job') return runJob(request);
  if (request?.kind !== 'render') return;
  const id = request.id;
  let lastPostMs = 0;
  try {
    const result = runRenderJob(request, {
      onBias: (bias) => reply({ kind: 'bias', id, bias }),
      onProgress: (fraction) => {
        const now = Date.now();
        // A few posts a second are enough for a progress bar.
        if (now - lastPostMs > 100 || fraction >= 1) {
          lastPostMs = now;
          reply({ kind: 'progress', id, fraction });
        }
      },
    });
    reply({ kind: 'done', id, result }, transferables(result));
  } catch (error) {
    const userFacing = isUserFacing(error);
    const message = error instanceof Error ? error.message : String(error);
    reply({
      kind: 'failed',
      id,
      message: userFacing ? message : `internal error (please report it): ${message}`,
      where: userFacing && 'where' in error ? String(error.where) : null,
      internal: !userFacing,
    });
  }
};
