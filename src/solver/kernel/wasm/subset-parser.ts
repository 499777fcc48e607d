/**
 * A parser for the small subset of JavaScript the kernel generator writes (`../generate.ts`):
 * declarations with initialisers, assignments, `if`/`else`, blocks, `for` loops with an optional
 * label, `break`/`continue`/`return`, arithmetic and comparisons, conditional and logical
 * operators, `Math` calls, and indexing of the kernel's four arrays. Anything else is refused
 * (`SubsetError`): the caller keeps the JavaScript kernel then. It reads our own generated code
 * only, never user text.
 */

export class SubsetError extends Error {}

export type Expr =
  | { kind: 'number'; value: number; integer: boolean }
  | { kind: 'boolean'; value: boolean }
  | { kind: 'name'; name: string }
  | { kind: 'index'; array: string; index: Expr }
  | { kind: 'call'; fn: string; args: Expr[] }
  | { kind: 'unary'; op: '-' | '!'; operand: Expr }
  | { kind: 'binary'; op: string; left: Expr; right: Expr }
  | { kind: 'conditional'; test: Expr; then: Expr; otherwise: Expr };

export type Target = { kind: 'name'; name: string } | { kind: 'index'; array: string; index: Expr };

export type Stmt =
  | { kind: 'declare'; names: { name: string; init: Expr }[] }
  | { kind: 'assign'; op: '=' | '+=' | '-=' | '*=' | '/='; target: Target; value: Expr }
  | { kind: 'increment'; target: Target }
  | { kind: 'if'; test: Expr; then: Stmt; otherwise: Stmt | null }
  | { kind: 'block'; body: Stmt[] }
  | { kind: 'for'; label: string | null; init: Stmt | null; test: Expr | null; update: Stmt | null; body: Stmt }
  | { kind: 'break'; label: string | null }
  | { kind: 'continue' }
  | { kind: 'return'; value: Expr };

const PUNCTUATORS = ['===', '!==', '<=', '>=', '&&', '||', '+=', '-=', '*=', '/=', '++', '(', ')', '{', '}', '[', ']', ';', ',', ':', '?', '.', '+', '-', '*', '/', '!', '<', '>', '&', '|', '='];

interface Token {
  kind: 'name' | 'number' | 'string' | 'punct' | 'end';
  text: string;
}

const NAME = /[A-Za-z_$][\w$]*/y;
const NUMBER = /\d+\.?\d*(e[+-]?\d+)?/iy;

/** The token a sticky expression matches at position i, or null. */
function readAt(pattern: RegExp, kind: 'name' | 'number', code: string, i: number): Token | null {
  pattern.lastIndex = i;
  const match = pattern.exec(code);
  return match ? { kind, text: match[0] } : null;
}

function tokenize(code: string): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  while (i < code.length) {
    const c = code[i];
    if (c === ' ' || c === '\n' || c === '\t' || c === '\r') {
      i++;
      continue;
    }
    const word = readAt(NAME, 'name', code, i) ?? readAt(NUMBER, 'number', code, i);
    if (word) {
      tokens.push(word);
      i += word.text.length;
      continue;
    }
    if (c === '"') {
      const end = code.indexOf('"', i + 1);
      if (end < 0) throw new SubsetError(`unterminated string at ${i}`);
      tokens.push({ kind: 'string', text: code.slice(i + 1, end) });
      i = end + 1;
      continue;
    }
    const punct = PUNCTUATORS.find((p) => code.startsWith(p, i));
    if (!punct) throw new SubsetError(`unexpected character ${JSON.stringify(c)} at ${i}`);
    tokens.push({ kind: 'punct', text: punct });
    i += punct.length;
  }
  tokens.push({ kind: 'end', text: '' });
  return tokens;
}

/** Binary operators by precedence, lowest first (JavaScript's order). */
const LEVELS: readonly (readonly string[])[] = [['||'], ['&&'], ['|'], ['&'], ['===', '!=='], ['<', '>', '<=', '>='], ['+', '-'], ['*', '/']];

export function parseSubset(code: string): Stmt[] {
  const tokens = tokenize(code);
  let at = 0;
  const peek = (offset = 0): Token => tokens[Math.min(at + offset, tokens.length - 1)];
  const next = (): Token => tokens[at++];
  const is = (text: string, offset = 0): boolean => {
    const t = peek(offset);
    return (t.kind === 'punct' || t.kind === 'name') && t.text === text;
  };
  const expect = (text: string): void => {
    const t = next();
    if (t.text !== text || (t.kind !== 'punct' && t.kind !== 'name')) throw new SubsetError(`expected ${text} at token ${at - 1}, got ${JSON.stringify(t.text)}`);
  };
  const name = (): string => {
    const t = next();
    if (t.kind !== 'name') throw new SubsetError(`expected a name at token ${at - 1}, got ${JSON.stringify(t.text)}`);
    return t.text;
  };

  function primary(): Expr {
    const t = next();
    if (t.kind === 'number') return { kind: 'number', value: Number(t.text), integer: /^\d+$/.test(t.text) };
    if (t.kind === 'punct' && t.text === '(') {
      const e = expression();
      expect(')');
      return e;
    }
    if (t.kind === 'name') {
      if (t.text === 'true' || t.text === 'false') return { kind: 'boolean', value: t.text === 'true' };
      if (t.text === 'Math') {
        expect('.');
        const fn = name();
        expect('(');
        const args: Expr[] = [];
        if (!is(')')) {
          args.push(expression());
          while (is(',')) {
            next();
            args.push(expression());
          }
        }
        expect(')');
        return { kind: 'call', fn, args };
      }
      if (is('[')) {
        next();
        const index = expression();
        expect(']');
        return { kind: 'index', array: t.text, index };
      }
      return { kind: 'name', name: t.text };
    }
    throw new SubsetError(`unexpected ${JSON.stringify(t.text)} at token ${at - 1}`);
  }

  function unary(): Expr {
    if (is('-') || is('!')) {
      const op = next().text as '-' | '!';
      const operand = unary();
      if (op === '-' && operand.kind === 'number') return { ...operand, value: -operand.value };
      return { kind: 'unary', op, operand };
    }
    return primary();
  }

  function binary(level: number): Expr {
    if (level === LEVELS.length) return unary();
    let left = binary(level + 1);
    for (;;) {
      const t = peek();
      if (t.kind !== 'punct' || !LEVELS[level].includes(t.text)) return left;
      next();
      left = { kind: 'binary', op: t.text, left, right: binary(level + 1) };
    }
  }

  function expression(): Expr {
    const test = binary(0);
    if (!is('?')) return test;
    next();
    const then = expression();
    expect(':');
    return { kind: 'conditional', test, then, otherwise: expression() };
  }

  function target(): Target {
    const n = name();
    if (is('[')) {
      next();
      const index = expression();
      expect(']');
      return { kind: 'index', array: n, index };
    }
    return { kind: 'name', name: n };
  }

  /** An assignment or increment (statements and `for` updates). */
  function simple(): Stmt {
    const t = target();
    const op = next().text;
    if (op === '++') return { kind: 'increment', target: t };
    if (op === '=' || op === '+=' || op === '-=' || op === '*=' || op === '/=') return { kind: 'assign', op, target: t, value: expression() };
    throw new SubsetError(`expected an assignment at token ${at - 1}, got ${JSON.stringify(op)}`);
  }

  function declaration(): Stmt {
    next(); // let / const
    const names: { name: string; init: Expr }[] = [];
    do {
      if (is(',')) next();
      const n = name();
      expect('=');
      names.push({ name: n, init: expression() });
    } while (is(','));
    return { kind: 'declare', names };
  }

  function endStatement(): void {
    if (is(';')) next();
  }

  function statement(): Stmt | null {
    const t = peek();
    if (t.kind === 'string') {
      next(); // a directive ("use strict")
      endStatement();
      return null;
    }
    if (t.kind === 'punct' && t.text === '{') {
      next();
      const body = statements('}');
      expect('}');
      return { kind: 'block', body };
    }
    if (t.kind === 'punct' && t.text === ';') {
      next();
      return null;
    }
    if (t.kind !== 'name') throw new SubsetError(`unexpected ${JSON.stringify(t.text)} at token ${at}`);
    if (is(':', 1)) {
      const label = name();
      next();
      if (!is('for')) throw new SubsetError(`a label on something other than a for loop at token ${at}`);
      return forLoop(label);
    }
    switch (t.text) {
      case 'let':
      case 'const': {
        const s = declaration();
        endStatement();
        return s;
      }
      case 'if': {
        next();
        expect('(');
        const test = expression();
        expect(')');
        const then = statement() ?? { kind: 'block', body: [] };
        let otherwise: Stmt | null = null;
        if (is('else')) {
          next();
          otherwise = statement() ?? { kind: 'block', body: [] };
        }
        return { kind: 'if', test, then, otherwise };
      }
      case 'for':
        return forLoop(null);
      case 'break': {
        next();
        const label = peek().kind === 'name' ? name() : null;
        endStatement();
        return { kind: 'break', label };
      }
      case 'continue':
        next();
        endStatement();
        return { kind: 'continue' };
      case 'return': {
        next();
        const value = expression();
        endStatement();
        return { kind: 'return', value };
      }
      default: {
        const s = simple();
        endStatement();
        return s;
      }
    }
  }

  function forLoop(label: string | null): Stmt {
    expect('for');
    expect('(');
    const init = is(';') ? null : is('let') ? declaration() : simple();
    expect(';');
    const test = is(';') ? null : expression();
    expect(';');
    const update = is(')') ? null : simple();
    expect(')');
    const body = statement() ?? { kind: 'block', body: [] };
    return { kind: 'for', label, init, test, update, body };
  }

  function statements(until: string | null): Stmt[] {
    const body: Stmt[] = [];
    while (peek().kind !== 'end' && !(until !== null && is(until))) {
      const s = statement();
      if (s) body.push(s);
    }
    return body;
  }

  const program = statements(null);
  if (peek().kind !== 'end') throw new SubsetError(`unexpected ${JSON.stringify(peek().text)} at token ${at}`);
  return program;
}
