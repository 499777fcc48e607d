/**
 * What survives a reload, in IndexedDB (idb-keyval): the scenario being
 * edited, the last recording imported, and the kept snapshots. Snapshots are
 * stored one key each with a small index beside them, so listing them does
 * not read every far end.
 */
import { createStore, del, get, set } from 'idb-keyval';
import type { LinkMetric } from '../../src/worker/messages.ts';
import type { ScenarioDoc } from './scenario-doc.ts';

const store = createStore('glowtalk-workbench', 'state');

export interface StoredRecording {
  name: string;
  samples: Float64Array;
  sampleRateHertz: number;
  /** Imported by the user, or one of the bundled sample recordings. */
  origin: 'imported' | 'bundled';
}

export interface SnapshotMeta {
  id: string;
  name: string;
  createdIso: string;
  label: string;
  renderedSeconds: number;
}

export interface Snapshot extends SnapshotMeta {
  json: ScenarioDoc['json'];
  metrics: LinkMetric[];
  summary: string[];
  farEnd: Float32Array;
  sampleRateHertz: number;
}

export const saveScenario = (doc: ScenarioDoc): Promise<void> => set('scenario', doc, store);
export const loadSavedScenario = (): Promise<ScenarioDoc | undefined> => get<ScenarioDoc>('scenario', store);
export const saveRecording = (recording: StoredRecording): Promise<void> => set('recording', recording, store);
export const loadSavedRecording = (): Promise<StoredRecording | undefined> => get<StoredRecording>('recording', store);

export async function listSnapshots(): Promise<SnapshotMeta[]> {
  return (await get<SnapshotMeta[]>('snapshot-index', store)) ?? [];
}

export async function saveSnapshot(snapshot: Snapshot): Promise<SnapshotMeta[]> {
  await set(`snapshot:${snapshot.id}`, snapshot, store);
  const { id, name, createdIso, label, renderedSeconds } = snapshot;
  const index = [...(await listSnapshots()).filter((m) => m.id !== id), { id, name, createdIso, label, renderedSeconds }];
  await set('snapshot-index', index, store);
  return index;
}

export const loadSnapshot = (id: string): Promise<Snapshot | undefined> => get<Snapshot>(`snapshot:${id}`, store);

export async function deleteSnapshot(id: string): Promise<SnapshotMeta[]> {
  await del(`snapshot:${id}`, store);
  const index = (await listSnapshots()).filter((m) => m.id !== id);
  await set('snapshot-index', index, store);
  return index;
}
