/**
 * Which settings each block of the chain shows, with units and how they are
 * written. Paths are those of the scenario file (docs/scenario-format.md);
 * `fallback` is the loader's default for a field that may be left out.
 */
import { TWO_TONE_PRESETS } from '../../src/audio/signals/two-tone.ts';
import { VOCAL_EFFORTS } from '../../src/link/acoustics/sound-level.ts';
import { SCENARIO_DEFAULTS } from '../../src/scenario/index.ts';
import { readAt, writeField, type Json, type JsonObject } from './scenario-doc.ts';

export const BLOCK_IDS = ['voice', 'microphone', 'transmitter', 'light', 'receiver', 'speaker', 'solver'] as const;
export type BlockId = (typeof BLOCK_IDS)[number];

export interface FieldSpec {
  path: string;
  label: string;
  /** Unit symbol shown after the value. */
  unit: string;
  kind: 'number' | 'choice' | 'toggle';
  /** Accepts SI prefixes (4.7k, 100n); plain-number fields (dB, degrees) do not. */
  engineering?: boolean;
  choices?: readonly (string | number | boolean)[];
  /** Choices read from the document (e.g. the refs of the LEDs in the transmitter circuit). */
  choicesFrom?: (json: JsonObject) => string[];
  /** Value used when the field is left out. */
  fallback?: Json;
  /** The field may be null (switched off); `onValue` is written when switched on. */
  nullable?: { offLabel: string; onValue: Json };
  /** Shown only when this holds for the document. */
  when?: (json: JsonObject) => boolean;
  /** A change that rewrites more than the field (e.g. a new source kind brings its own fields). */
  apply?: (json: JsonObject, value: Json) => JsonObject;
  hint?: string;
}

const sourceKind = (json: JsonObject) => readAt(json, 'source.kind');
const channelKind = (json: JsonObject) => readAt(json, 'lightPath.channel.kind');
const hasAmbient = (json: JsonObject) => readAt(json, 'lightPath.ambient') !== null && readAt(json, 'lightPath.ambient') !== undefined;
const levelBy = (json: JsonObject) => (readAt(json, 'source.level.effort') !== undefined ? 'effort' : 'dbSpl');

/** Fields each source kind needs, written when the kind is chosen. */
const SOURCE_TEMPLATES: Record<string, JsonObject> = {
  recording: { file: 'recording.wav' },
  tone: { frequency: 1000, seconds: 3 },
  'two-tone': { preset: 'smpte', seconds: 3 },
  sweep: { start: 50, end: 12000, seconds: 3 },
  'pink-noise': { seconds: 3 },
  'speech-like': { seconds: 6 },
};

const CHANNEL_TEMPLATES: Record<string, JsonObject> = {
  'free-space': { kind: 'free-space', distance: 0.5, halfPowerSemiAngle: 30, detectorArea: '10u' },
  'light-guide': { kind: 'light-guide', length: 2, couplingLoss: 3, attenuation: 0.2 },
};

function setSourceKind(json: JsonObject, kind: Json): JsonObject {
  const level = readAt(json, 'source.level') ?? { dbSpl: 70 };
  // A recording keeps its file name when switching back.
  const file = readAt(json, 'source.file');
  const template = { ...SOURCE_TEMPLATES[String(kind)] };
  if (kind === 'recording' && typeof file === 'string') template.file = file;
  return writeField(json, 'source', { kind, ...template, level });
}

function setLevelBy(json: JsonObject, by: Json): JsonObject {
  return writeField(json, 'source.level', by === 'effort' ? { effort: 'normal', distance: 0.3 } : { dbSpl: 72 });
}

/** Refs of the parts of some kinds in a circuit of the document. */
function refsOf(block: 'transmitter' | 'receiver', kinds: string[]): (json: JsonObject) => string[] {
  return (json) => {
    const parts = readAt(json, `${block}.circuit.parts`);
    if (!Array.isArray(parts)) return [];
    return parts.flatMap((p) => (p && typeof p === 'object' && !Array.isArray(p) && kinds.includes(String(p.kind)) && typeof p.ref === 'string' ? [p.ref] : []));
  };
}

const MODEL_KINDS_SHOWN = { 'free-space': 'line of sight', 'light-guide': 'light guide' };

export const FIELDS: Record<BlockId, FieldSpec[]> = {
  voice: [
    { path: 'source.kind', label: 'Source', unit: '', kind: 'choice', choices: Object.keys(SOURCE_TEMPLATES), apply: setSourceKind },
    { path: 'source.file', label: 'Recording', unit: '', kind: 'choice', choices: [], when: (j) => sourceKind(j) === 'recording', hint: 'import a WAV to change it' },
    { path: 'source.level.by', label: 'Level given as', unit: '', kind: 'choice', choices: ['dbSpl', 'effort'], apply: setLevelBy },
    { path: 'source.level.dbSpl', label: 'Level at the microphone', unit: 'dB SPL', kind: 'number', when: (j) => levelBy(j) === 'dbSpl' },
    { path: 'source.level.effort', label: 'Vocal effort', unit: '', kind: 'choice', choices: VOCAL_EFFORTS, when: (j) => levelBy(j) === 'effort' },
    { path: 'source.level.distance', label: 'Talker distance', unit: 'm', kind: 'number', engineering: true, when: (j) => levelBy(j) === 'effort' },
    { path: 'source.frequency', label: 'Frequency', unit: 'Hz', kind: 'number', engineering: true, when: (j) => sourceKind(j) === 'tone' },
    { path: 'source.preset', label: 'Tone pair', unit: '', kind: 'choice', choices: Object.keys(TWO_TONE_PRESETS), when: (j) => sourceKind(j) === 'two-tone' },
    { path: 'source.start', label: 'Sweep start', unit: 'Hz', kind: 'number', engineering: true, when: (j) => sourceKind(j) === 'sweep' },
    { path: 'source.end', label: 'Sweep end', unit: 'Hz', kind: 'number', engineering: true, when: (j) => sourceKind(j) === 'sweep' },
    { path: 'source.seconds', label: 'Length', unit: 's', kind: 'number', engineering: true, when: (j) => sourceKind(j) !== 'recording' },
    {
      path: 'source.seed',
      label: 'Seed',
      unit: '',
      kind: 'number',
      fallback: SCENARIO_DEFAULTS.sourceSeed,
      when: (j) => sourceKind(j) === 'pink-noise' || sourceKind(j) === 'speech-like',
    },
  ],
  microphone: [
    { path: 'microphone.sensitivity', label: 'Sensitivity', unit: 'dBV/Pa', kind: 'number' },
    { path: 'microphone.outputResistance', label: 'Output resistance', unit: 'Ω', kind: 'number', engineering: true },
    { path: 'microphone.selfNoise', label: 'Self-noise (A-weighted)', unit: 'dB SPL', kind: 'number', nullable: { offLabel: 'noiseless', onValue: 28 } },
    { path: 'microphone.seed', label: 'Noise seed', unit: '', kind: 'number', fallback: SCENARIO_DEFAULTS.microphoneSeed },
  ],
  transmitter: [
    { path: 'transmitter.input', label: 'Microphone drives', unit: '', kind: 'choice', choicesFrom: refsOf('transmitter', ['voltage-source']), hint: 'a voltage source whose wave is "upstream"' },
    { path: 'transmitter.led', label: 'Signal LED', unit: '', kind: 'choice', choicesFrom: refsOf('transmitter', ['led']) },
    { path: 'transmitter.cutoffCurrent', label: 'LED counts as cut off below', unit: 'A', kind: 'number', engineering: true, fallback: SCENARIO_DEFAULTS.cutoffAmperes },
  ],
  light: [
    {
      path: 'lightPath.channel.kind',
      label: 'Channel',
      unit: '',
      kind: 'choice',
      choices: Object.keys(CHANNEL_TEMPLATES),
      apply: (json, kind) => writeField(json, 'lightPath.channel', CHANNEL_TEMPLATES[String(kind)]),
      hint: Object.entries(MODEL_KINDS_SHOWN).map(([k, v]) => `${k}: ${v}`).join('; '),
    },
    { path: 'lightPath.channel.distance', label: 'Distance', unit: 'm', kind: 'number', engineering: true, when: (j) => channelKind(j) === 'free-space' },
    { path: 'lightPath.channel.halfPowerSemiAngle', label: 'LED half-power semi-angle', unit: '°', kind: 'number', when: (j) => channelKind(j) === 'free-space' },
    {
      path: 'lightPath.channel.detectorArea',
      label: 'Detector area',
      unit: 'm²',
      kind: 'number',
      engineering: true,
      when: (j) => channelKind(j) === 'free-space',
      hint: '"10u" is 10 mm²',
    },
    { path: 'lightPath.channel.irradianceAngle', label: 'Off the LED axis', unit: '°', kind: 'number', fallback: 0, when: (j) => channelKind(j) === 'free-space' },
    { path: 'lightPath.channel.incidenceAngle', label: 'Off the detector axis', unit: '°', kind: 'number', fallback: 0, when: (j) => channelKind(j) === 'free-space' },
    { path: 'lightPath.channel.filterTransmission', label: 'Filter transmission', unit: '', kind: 'number', fallback: 1, when: (j) => channelKind(j) === 'free-space' },
    {
      path: 'lightPath.channel.concentratorIndex',
      label: 'Concentrator index',
      unit: '',
      kind: 'number',
      fallback: null,
      nullable: { offLabel: 'none', onValue: 1.5 },
      when: (j) => channelKind(j) === 'free-space',
    },
    { path: 'lightPath.channel.fieldOfView', label: 'Detector field of view', unit: '°', kind: 'number', fallback: 90, when: (j) => channelKind(j) === 'free-space' },
    { path: 'lightPath.channel.length', label: 'Guide length', unit: 'm', kind: 'number', engineering: true, when: (j) => channelKind(j) === 'light-guide' },
    { path: 'lightPath.channel.couplingLoss', label: 'Coupling loss', unit: 'dB', kind: 'number', when: (j) => channelKind(j) === 'light-guide' },
    { path: 'lightPath.channel.attenuation', label: 'Attenuation', unit: 'dB/m', kind: 'number', when: (j) => channelKind(j) === 'light-guide' },
    {
      path: 'lightPath.ambient',
      label: 'Ambient light',
      unit: '',
      kind: 'toggle',
      nullable: { offLabel: 'dark', onValue: { power: '1u', mainsFrequency: 50, flickerDepth: 0.3 } },
    },
    { path: 'lightPath.ambient.power', label: 'Ambient power at the detector', unit: 'W', kind: 'number', engineering: true, when: hasAmbient },
    { path: 'lightPath.ambient.mainsFrequency', label: 'Mains frequency', unit: 'Hz', kind: 'choice', choices: [50, 60], when: hasAmbient },
    { path: 'lightPath.ambient.flickerDepth', label: 'Flicker depth', unit: '', kind: 'number', when: hasAmbient },
    { path: 'lightPath.darkCurrent', label: 'Detector dark current', unit: 'A', kind: 'number', engineering: true, fallback: SCENARIO_DEFAULTS.darkCurrentAmperes },
    { path: 'lightPath.shotNoise', label: 'Shot noise', unit: '', kind: 'choice', choices: [true, false], fallback: SCENARIO_DEFAULTS.shotNoise },
    {
      path: 'lightPath.thermalNoiseResistance',
      label: 'Thermal-noise resistance',
      unit: 'Ω',
      kind: 'number',
      engineering: true,
      fallback: null,
      nullable: { offLabel: 'none', onValue: '10k' },
    },
    { path: 'lightPath.seed', label: 'Noise seed', unit: '', kind: 'number', fallback: SCENARIO_DEFAULTS.lightPathSeed },
  ],
  receiver: [
    { path: 'receiver.detector', label: 'Detector', unit: '', kind: 'choice', choicesFrom: refsOf('receiver', ['phototransistor']) },
    { path: 'receiver.speaker', label: 'Speaker load placed by the chain', unit: 'Ω', kind: 'number', engineering: true, nullable: { offLabel: 'circuit has its own', onValue: 8 } },
  ],
  speaker: [
    { path: 'output.listeningGain', label: 'Listening gain (WAV export)', unit: 'dB', kind: 'number', fallback: SCENARIO_DEFAULTS.listeningGainDb },
    { path: 'output.format', label: 'Far-end WAV format', unit: '', kind: 'choice', choices: ['pcm16', 'float32'], fallback: SCENARIO_DEFAULTS.outputFormat },
  ],
  solver: [
    { path: 'sampleRate', label: 'Audio sample rate', unit: 'Hz', kind: 'number', engineering: true, fallback: SCENARIO_DEFAULTS.sampleRateHertz },
    { path: 'oversampling', label: 'Oversampling', unit: '×', kind: 'choice', choices: [2, 4, 8], fallback: SCENARIO_DEFAULTS.oversampling },
    { path: 'method', label: 'Integration rule', unit: '', kind: 'choice', choices: ['tr', 'bdf2'], fallback: SCENARIO_DEFAULTS.method, hint: 'tr: trapezoidal; bdf2: second-order backward difference' },
  ],
};

/** The value a field shows: as written, else its default; `source.level.by` is derived. */
export function fieldValue(json: JsonObject, spec: FieldSpec): Json | undefined {
  if (spec.path === 'source.level.by') return levelBy(json);
  const value = readAt(json, spec.path);
  return value === undefined ? spec.fallback : value;
}
