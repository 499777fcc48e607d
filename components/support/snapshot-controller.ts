/**
 * Kept snapshots for an element, as a Lit reactive controller: the list (from
 * IndexedDB), the one being compared, keeping and deleting.
 */
import type { ReactiveController, ReactiveControllerHost } from 'lit';
import type { RenderedLink } from '../../src/worker/messages.ts';
import type { JsonObject } from './scenario-doc.ts';
import * as store from './workbench-store.ts';

export class SnapshotController implements ReactiveController {
  list: store.SnapshotMeta[] = [];
  compared: store.Snapshot | null = null;

  constructor(private readonly host: ReactiveControllerHost) {
    host.addController(this);
  }

  hostConnected(): void {}

  async load(): Promise<void> {
    this.list = await store.listSnapshots();
    this.host.requestUpdate();
  }

  /** Keeps a render with the document it was made from. */
  async keep(name: string, run: RenderedLink, json: JsonObject, label: string): Promise<void> {
    this.list = await store.saveSnapshot({
      id: crypto.randomUUID(),
      name,
      createdIso: new Date().toISOString(),
      label,
      renderedSeconds: run.renderedSeconds,
      json,
      metrics: run.metrics,
      summary: run.summary,
      farEnd: Float32Array.from(run.farEndVolts),
      sampleRateHertz: run.sampleRateHertz,
    });
    this.host.requestUpdate();
  }

  async compareWith(id: string | null): Promise<void> {
    this.compared = id === null ? null : ((await store.loadSnapshot(id)) ?? null);
    this.host.requestUpdate();
  }

  async remove(id: string): Promise<void> {
    this.list = await store.deleteSnapshot(id);
    if (this.compared?.id === id) this.compared = null;
    this.host.requestUpdate();
  }
}
