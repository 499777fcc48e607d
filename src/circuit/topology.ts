/**
 * Topology checks a solver needs before it starts: a ground node, a DC path
 * from every node to ground, and no loop made only of voltage sources and
 * inductors (both would make the DC system singular).
 */
import { InputError } from '../errors.ts';
import { jsonPath } from './json-text.ts';
import { GROUND, type Circuit, type Part } from './types.ts';

/** Disjoint sets over node names (path halving). */
class NodeSets {
  private readonly parent = new Map<string, string>();

  find(node: string): string {
    let current = node;
    for (;;) {
      const up = this.parent.get(current) ?? current;
      if (up === current) return current;
      const grand = this.parent.get(up) ?? up;
      this.parent.set(current, grand);
      current = grand;
    }
  }

  /** Joins the sets of a and b; false if they were already one set. */
  union(a: string, b: string): boolean {
    const rootA = this.find(a);
    const rootB = this.find(b);
    if (rootA === rootB) return false;
    this.parent.set(rootA, rootB);
    return true;
  }
}

/** Parts that carry DC between their pins. Capacitors and current sources do not. */
function conductsDc(part: Part): boolean {
  return part.kind !== 'capacitor' && part.kind !== 'current-source';
}

/**
 * Throws an InputError naming the parts (as `<pathPrefix>parts[i]`) for:
 * no ground node, a node with no DC path to ground, or a loop of voltage
 * sources and/or inductors.
 */
export function checkTopology(circuit: Circuit, pathPrefix = ''): void {
  const at = (...segments: PropertyKey[]) => jsonPath(pathPrefix, segments);
  const { parts } = circuit;

  if (!parts.some((part) => part.pins.includes(GROUND))) {
    const lookalike = parts.flatMap((part) => part.pins).find((node) => /^(gnd|ground|0)$/i.test(node));
    throw new InputError(
      at('parts'),
      `at least one pin connected to "${GROUND}" (ground)`,
      `no pin is "${GROUND}"${lookalike ? ` (node names are exact: "${lookalike}" is not ground)` : ''}`,
    );
  }

  checkSourceInductorLoops(parts, at);
  checkDcPaths(parts, at);
}

function checkDcPaths(parts: readonly Part[], at: (...segments: PropertyKey[]) => string): void {
  const sets = new NodeSets();
  for (const part of parts) {
    if (!conductsDc(part)) continue;
    // A transistor's junctions tie all its pins together for DC.
    for (let i = 1; i < part.pins.length; i++) sets.union(part.pins[0], part.pins[i]);
  }
  const groundRoot = sets.find(GROUND);
  for (let p = 0; p < parts.length; p++) {
    const pins = parts[p].pins;
    for (let i = 0; i < pins.length; i++) {
      const node = pins[i];
      if (sets.find(node) === groundRoot) continue;
      const touching = parts.filter((part) => part.pins.includes(node)).map((part) => `${part.ref} (${part.kind})`);
      throw new InputError(
        at('parts', p, 'pins', i),
        `every node to reach "${GROUND}" through resistors, inductors, voltage sources, diodes, LEDs or transistors (for example a large resistor to "${GROUND}")`,
        `node "${node}" has no DC path to ground; it touches ${touching.join(', ')}`,
      );
    }
  }
}

function checkSourceInductorLoops(parts: readonly Part[], at: (...segments: PropertyKey[]) => string): void {
  const sets = new NodeSets();
  // Edges accepted so far, to name the loop once one closes.
  const edges: Array<{ index: number; a: string; b: string }> = [];
  for (let p = 0; p < parts.length; p++) {
    const part = parts[p];
    if (part.kind !== 'voltage-source' && part.kind !== 'inductor') continue;
    const [a, b] = part.pins;
    if (sets.union(a, b)) {
      edges.push({ index: p, a, b });
      continue;
    }
    const loop = [...pathBetween(edges, a, b), p].map((index) => `${parts[index].ref} (${parts[index].kind})`);
    throw new InputError(
      at('parts', p),
      'no loop made only of voltage sources and inductors (add a series resistance, or remove one source)',
      a === b ? `${loop[0]} has both pins on node "${a}"` : `${loop.join(', ')} form a loop`,
    );
  }
}

/** Part indices along the unique path from `from` to `to` in a forest of edges (breadth-first). */
function pathBetween(edges: ReadonlyArray<{ index: number; a: string; b: string }>, from: string, to: string): number[] {
  const cameBy = new Map<string, { node: string; index: number } | null>([[from, null]]);
  const queue = [from];
  while (queue.length > 0) {
    const node = queue.shift()!;
    if (node === to) break;
    for (const edge of edges) {
      const next = edge.a === node ? edge.b : edge.b === node ? edge.a : null;
      if (next === null || cameBy.has(next)) continue;
      cameBy.set(next, { node, index: edge.index });
      queue.push(next);
    }
  }
  const path: number[] = [];
  for (let step = cameBy.get(to); step; step = cameBy.get(step.node)) path.unshift(step.index);
  return path;
}
