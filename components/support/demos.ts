/**
 * The scenarios bundled with the page: every scenario.json in a samples/demo-NAME
 * folder (its circuit files beside it), plus the small bench starter, and the
 * sample recordings they may name. Found at build time by Vite's glob
 * import, so a new demo folder appears without code changes.
 */
import { decodeWav } from '../../src/audio/wav-read.ts';
import { baseName, docFromText, type ScenarioDoc } from './scenario-doc.ts';
import type { StoredRecording } from './workbench-store.ts';

const demoFiles = import.meta.glob('/samples/demo-*/*.json', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;
const starterFiles = import.meta.glob('../scenarios/*.json', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;
const recordingUrls = import.meta.glob('/samples/**/*.wav', { query: '?url', import: 'default', eager: true }) as Record<string, string>;

export interface DemoEntry {
  id: string;
  title: string;
  /** Folder the scenario's relative paths start from, e.g. "/samples/demo-bay/". */
  baseDir: string;
  load(): ScenarioDoc;
}

function titleOf(text: string, fallback: string): string {
  try {
    const title = (JSON.parse(text) as { title?: unknown }).title;
    return typeof title === 'string' && title !== '' ? title : fallback;
  } catch {
    return fallback;
  }
}

function entriesFrom(files: Record<string, string>, idOf: (path: string) => string): DemoEntry[] {
  const out: DemoEntry[] = [];
  for (const [path, text] of Object.entries(files)) {
    const name = baseName(path);
    const dir = path.slice(0, path.length - name.length);
    const isScenario = name === 'scenario.json' || /"format"\s*:\s*"glowtalk\.scenario\/1"/.test(text);
    if (!isScenario) continue;
    const siblings: Record<string, string> = {};
    for (const [other, otherText] of Object.entries(files)) if (other.startsWith(dir) && other !== path) siblings[baseName(other)] = otherText;
    const id = idOf(path);
    out.push({
      id,
      title: titleOf(text, id),
      baseDir: dir,
      load: () => ({ ...docFromText(text, `${id}/${name}`, siblings).doc, baseDir: dir }),
    });
  }
  return out;
}

/** Demos first (by folder name), then the bench starter. */
export const DEMOS: DemoEntry[] = [
  ...entriesFrom(demoFiles, (path) => path.split('/').slice(-2, -1)[0]).sort((a, b) => a.id.localeCompare(b.id)),
  ...entriesFrom(starterFiles, (path) => baseName(path).replace(/\.json$/, '')),
];

/** URL of a bundled recording named by a scenario (relative to its folder, or by bare name). */
export function bundledRecordingUrl(file: string, baseDir: string | undefined): string | null {
  if (baseDir) {
    const resolved = new URL(file, `https://glowtalk.invalid${baseDir}`).pathname;
    if (recordingUrls[resolved]) return recordingUrls[resolved];
  }
  const name = baseName(file);
  const match = Object.keys(recordingUrls).find((path) => baseName(path) === name);
  return match ? recordingUrls[match] : null;
}

export async function fetchBundledRecording(url: string, name: string): Promise<StoredRecording> {
  const response = await fetch(url);
  if (!response.ok) throw new Error(`could not fetch the bundled recording ${name} (HTTP ${response.status})`);
  const decoded = decodeWav(new Uint8Array(await response.arrayBuffer()), name);
  return { name, samples: decoded.mono, sampleRateHertz: decoded.sampleRateHertz, origin: 'bundled' };
}
