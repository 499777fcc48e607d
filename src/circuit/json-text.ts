/**
 * JSON text and JSON paths for error messages: parse text with line/column
 * on syntax errors and duplicate keys (JSON.parse silently keeps the last
 * one, which hides typos), and spell paths like `parts[2].pins`.
 */
import { InputError } from '../errors.ts';

const MAX_DEPTH = 256;

/** `jsonPath('chain[2].circuit', ['parts', 0, 'value'])` === "chain[2].circuit.parts[0].value"; ['models', 'my led'] gives models["my led"]. */
export function jsonPath(prefix: string, segments: ReadonlyArray<PropertyKey>): string {
  // A prefix ending in ":" is a file label: "amp.json: parts[0]".
  let path = prefix;
  for (const segment of segments) {
    const name = String(segment);
    if (typeof segment === 'number') path += `[${segment}]`;
    else if (/^[A-Za-z_][A-Za-z0-9_-]*$/.test(name)) path += path === '' ? name : path.endsWith(':') ? ` ${name}` : `.${name}`;
    else path += `${path.endsWith(':') ? ' ' : ''}[${JSON.stringify(name)}]`;
  }
  return path === '' ? 'top level' : path.endsWith(':') ? `${path} top level` : path;
}

/** Parses JSON text; bad syntax or a repeated key throws an InputError at "<label> line L, column C". */
export function parseJsonText(text: string, label = 'input'): unknown {
  // A UTF-8 byte-order mark is harmless; JSON.parse would reject it.
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const problem = new JsonScanner(body).scanDocument();
  if (problem) {
    const { line, column } = lineAndColumn(body, problem.offset);
    throw new InputError(`${label} line ${line}, column ${column}`, problem.expected, problem.detail);
  }
  try {
    return JSON.parse(body);
  } catch (error) {
    // The scanner follows RFC 8259, so this is not expected; still report it as bad input.
    throw new InputError(label, 'valid JSON (RFC 8259)', error instanceof Error ? error.message : String(error));
  }
}

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text[i] === '\n') {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

interface Problem {
  offset: number;
  expected: string;
  detail: string;
}

/** Validating scanner for RFC 8259 JSON; returns the first problem or null. */
class JsonScanner {
  private at = 0;
  constructor(private readonly text: string) {}

  scanDocument(): Problem | null {
    return this.value(0) ?? this.whitespace() ?? (this.at < this.text.length ? this.fail('end of input after the JSON value') : null);
  }

  private fail(expected: string): Problem {
    const found = this.at >= this.text.length ? 'end of input' : `found ${JSON.stringify(this.text[this.at])}`;
    return { offset: this.at, expected, detail: found };
  }

  private whitespace(): null {
    while (this.at < this.text.length && ' \t\n\r'.includes(this.text[this.at])) this.at++;
    return null;
  }

  private value(depth: number): Problem | null {
    this.whitespace();
    if (depth > MAX_DEPTH) return this.fail(`nesting no deeper than ${MAX_DEPTH}`);
    const c = this.text[this.at];
    if (c === '{') return this.object(depth);
    if (c === '[') return this.array(depth);
    if (c === '"') return this.string().problem;
    if (c === '-' || (c >= '0' && c <= '9')) return this.number();
    for (const word of ['true', 'false', 'null']) {
      if (this.text.startsWith(word, this.at)) {
        this.at += word.length;
        return null;
      }
    }
    if (c === ']' || c === '}') return this.fail('a JSON value (JSON allows no trailing comma before a closing bracket)');
    return this.fail('a JSON value (object, array, string, number, true, false or null; strings need double quotes)');
  }

  private object(depth: number): Problem | null {
    this.at++;
    const seen = new Set<string>();
    this.whitespace();
    if (this.text[this.at] === '}') return (this.at++, null);
    for (;;) {
      this.whitespace();
      const keyStart = this.at;
      if (this.text[this.at] === '}') return this.fail('a key in double quotes (JSON allows no trailing comma before a closing brace)');
      if (this.text[this.at] !== '"') return this.fail('a key in double quotes');
      const key = this.string();
      if (key.problem) return key.problem;
      if (seen.has(key.value)) return { offset: keyStart, expected: 'each key once per object', detail: `key ${JSON.stringify(key.value)} repeated` };
      seen.add(key.value);
      this.whitespace();
      if (this.text[this.at] !== ':') return this.fail('":" after the key');
      this.at++;
      const problem = this.value(depth + 1);
      if (problem) return problem;
      this.whitespace();
      if (this.text[this.at] === ',') this.at++;
      else if (this.text[this.at] === '}') return (this.at++, null);
      else return this.fail('"," or "}" (no trailing commas or comments in JSON)');
    }
  }

  private array(depth: number): Problem | null {
    this.at++;
    this.whitespace();
    if (this.text[this.at] === ']') return (this.at++, null);
    for (;;) {
      const problem = this.value(depth + 1);
      if (problem) return problem;
      this.whitespace();
      if (this.text[this.at] === ',') this.at++;
      else if (this.text[this.at] === ']') return (this.at++, null);
      else return this.fail('"," or "]" (no trailing commas or comments in JSON)');
    }
  }

  private string(): { value: string; problem: Problem | null } {
    const start = ++this.at;
    for (;;) {
      const c = this.text[this.at];
      if (c === undefined) return { value: '', problem: this.fail('a closing double quote') };
      if (c === '"') break;
      if (c < ' ') return { value: '', problem: this.fail('no raw control characters inside a string (use \\n, \\t)') };
      if (c === '\\') {
        const escape = this.text[this.at + 1];
        if (escape === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(this.text.slice(this.at + 2, this.at + 6))) return { value: '', problem: this.fail('\\u followed by 4 hex digits') };
          this.at += 6;
          continue;
        }
        if (escape === undefined || !'"\\/bfnrt'.includes(escape)) return { value: '', problem: this.fail('a valid escape (\\" \\\\ \\/ \\b \\f \\n \\r \\t \\uXXXX)') };
        this.at += 2;
        continue;
      }
      this.at++;
    }
    const raw = this.text.slice(start - 1, this.at + 1);
    this.at++;
    return { value: JSON.parse(raw) as string, problem: null };
  }

  private number(): Problem | null {
    const match = /^-?(?:0|[1-9][0-9]*)(?:\.[0-9]+)?(?:[eE][+-]?[0-9]+)?/.exec(this.text.slice(this.at, this.at + 400));
    if (!match) return this.fail('a JSON number such as 4700 or 4.7e3 (engineering notation like 4.7k must be a string: "4.7k")');
    this.at += match[0].length;
    const next = this.text[this.at];
    if (next !== undefined && /[A-Za-z0-9.\u00b5\u03bc]/.test(next)) {
      return this.fail('a JSON number such as 4700 or 4.7e3 (engineering notation like 4.7k must be a string: "4.7k")');
    }
    return null;
  }
}
