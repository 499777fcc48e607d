import { ByteWriter, OP, TYPE, kernelModule } from './encoder.ts';
import { SubsetError, parseSubset, type Expr, type Stmt, type Target } from './subset-parser.ts';

/**
 * Translates a generated step kernel (the JavaScript of `../generate.ts`) into a WebAssembly
 * module with the same arithmetic in the same order: every double operation maps to one
 * instruction of the same IEEE 754 meaning, `Math.exp` and `Math.log` are the host's own
 * (imported), so the module's answers are the JavaScript kernel's to the bit. What it gains
 * is code the engine compiles once, ahead of running it, with no array checks and no trips
 * back to unoptimised code.
 *
 * The kernel's arrays live in one memory: the state `s`, the constants `k`, then room for
 * `capacity` steps of `input` and of `out`. Step indices are relative to the call (the
 * caller shifts them).
 */

type ValueType = 'f64' | 'i32' | 'bool';
/** `lit`: an integer literal, which takes the type its neighbours want. */
type StaticType = ValueType | 'lit';

interface Local {
  index: number;
  type: ValueType;
}

interface Control {
  kind: 'break' | 'continue' | 'other';
  label: string | null;
}

export interface KernelMemory {
  /** Byte offsets of the regions. */
  state: number;
  constants: number;
  input: number;
  out: number;
  /** Bytes in all. */
  bytes: number;
}

export function kernelMemory(stateLength: number, constantCount: number, size: number, capacity: number): KernelMemory {
  const state = 0;
  const constants = state + 8 * stateLength;
  const input = constants + 8 * constantCount;
  const out = input + 8 * capacity;
  return { state, constants, input, out, bytes: out + 8 * capacity * size };
}

const WASM_TYPE: Record<ValueType, number> = { f64: TYPE.f64, i32: TYPE.i32, bool: TYPE.i32 };
const COMPARE = {
  f64: { '===': OP.f64Eq, '!==': OP.f64Ne, '<': OP.f64Lt, '>': OP.f64Gt, '<=': OP.f64Le, '>=': OP.f64Ge },
  i32: { '===': OP.i32Eq, '!==': OP.i32Ne, '<': OP.i32LtS, '>': OP.i32GtS, '<=': OP.i32LeS, '>=': OP.i32GeS },
} as const;
const ARITHMETIC = {
  f64: { '+': OP.f64Add, '-': OP.f64Sub, '*': OP.f64Mul, '/': OP.f64Div },
  i32: { '+': OP.i32Add, '-': OP.i32Sub, '*': OP.i32Mul },
} as const;

export function compileKernelModule(code: string, memory: KernelMemory): Uint8Array {
  const program = parseSubset(code);
  const compiler = new FunctionCompiler({ s: memory.state, k: memory.constants, input: memory.input, out: memory.out });
  for (const s of program) compiler.statement(s);
  return kernelModule(compiler.localTypes, compiler.body, Math.ceil(memory.bytes / 65536));
}

class FunctionCompiler {
  readonly body = new ByteWriter();
  /** Types of the locals after the two parameters. */
  readonly localTypes: number[] = [];
  private readonly scopes: Map<string, Local>[] = [
    new Map<string, Local>([
      ['from', { index: 0, type: 'i32' }],
      ['to', { index: 1, type: 'i32' }],
    ]),
  ];
  private readonly control: Control[] = [];

  constructor(private readonly arrays: Record<string, number>) {}

  statement(s: Stmt): void {
    const b = this.body;
    switch (s.kind) {
      case 'declare':
        for (const { name, init } of s.names) {
          const type = concrete(this.typeOf(init), 'f64');
          this.expr(init, type);
          const local = this.declare(name, type);
          b.byte(OP.localSet);
          b.unsigned(local.index);
        }
        return;
      case 'assign':
        return this.assign(s.op, s.target, s.value);
      case 'increment': {
        const local = this.target(s.target);
        if (local.type === 'bool') throw new SubsetError(`++ on a boolean ${describe(s.target)}`);
        b.byte(OP.localGet);
        b.unsigned(local.index);
        this.literal(1, local.type);
        b.byte(local.type === 'i32' ? OP.i32Add : OP.f64Add);
        b.byte(OP.localSet);
        b.unsigned(local.index);
        return;
      }
      case 'if':
        this.expr(s.test, 'bool');
        b.byte(OP.if);
        b.byte(TYPE.empty);
        this.control.push({ kind: 'other', label: null });
        this.scoped(s.then);
        if (s.otherwise) {
          b.byte(OP.else);
          this.scoped(s.otherwise);
        }
        this.control.pop();
        b.byte(OP.end);
        return;
      case 'block':
        this.scopes.push(new Map());
        for (const inner of s.body) this.statement(inner);
        this.scopes.pop();
        return;
      case 'for':
        this.scopes.push(new Map());
        if (s.init) this.statement(s.init);
        b.byte(OP.block);
        b.byte(TYPE.empty);
        this.control.push({ kind: 'break', label: s.label });
        b.byte(OP.loop);
        b.byte(TYPE.empty);
        this.control.push({ kind: 'other', label: null });
        if (s.test) {
          this.expr(s.test, 'bool');
          b.byte(OP.i32Eqz);
          b.byte(OP.brIf);
          b.unsigned(1); // out of the loop's block
        }
        b.byte(OP.block);
        b.byte(TYPE.empty);
        this.control.push({ kind: 'continue', label: s.label });
        this.scoped(s.body);
        this.control.pop();
        b.byte(OP.end);
        if (s.update) this.statement(s.update);
        b.byte(OP.br);
        b.unsigned(0);
        this.control.pop();
        b.byte(OP.end);
        this.control.pop();
        b.byte(OP.end);
        this.scopes.pop();
        return;
      case 'break':
      case 'continue': {
        const kind = s.kind;
        const label = s.kind === 'break' ? s.label : null;
        for (let depth = 0; depth < this.control.length; depth++) {
          const c = this.control[this.control.length - 1 - depth];
          if (c.kind === kind && (label === null || c.label === label)) {
            b.byte(OP.br);
            b.unsigned(depth);
            return;
          }
        }
        throw new SubsetError(`${kind} ${label ?? ''} outside a loop`);
      }
      case 'return':
        this.expr(s.value, 'i32');
        b.byte(OP.return);
        return;
    }
  }

  /** A statement in a scope of its own (the body of an `if` or a loop). */
  private scoped(s: Stmt): void {
    this.scopes.push(new Map());
    this.statement(s);
    this.scopes.pop();
  }

  private declare(name: string, type: ValueType): Local {
    const local = { index: 2 + this.localTypes.length, type };
    this.localTypes.push(WASM_TYPE[type]);
    this.scopes[this.scopes.length - 1].set(name, local);
    return local;
  }

  private lookup(name: string): Local {
    for (let i = this.scopes.length - 1; i >= 0; i--) {
      const local = this.scopes[i].get(name);
      if (local) return local;
    }
    throw new SubsetError(`${name} is not declared`);
  }

  private target(t: Target): Local {
    if (t.kind !== 'name') throw new SubsetError(`an update of ${describe(t)}`);
    return this.lookup(t.name);
  }

  private assign(op: '=' | '+=' | '-=' | '*=' | '/=', target: Target, value: Expr): void {
    const b = this.body;
    if (target.kind === 'index') {
      const at = this.address(target.array, target.index);
      if (op !== '=') {
        if (target.index.kind !== 'number') throw new SubsetError(`${op} on ${describe(target)}`);
        this.load(target.array, target.index);
      }
      this.expr(value, 'f64');
      if (op !== '=') b.byte(ARITHMETIC.f64[op[0] as '+' | '-' | '*' | '/']);
      b.byte(OP.f64Store);
      b.unsigned(3);
      b.unsigned(at);
      return;
    }
    const local = this.lookup(target.name);
    if (op === '=') {
      this.expr(value, local.type);
    } else {
      if (local.type === 'bool') throw new SubsetError(`${op} on a boolean ${target.name}`);
      const type = op === '/=' ? 'f64' : local.type;
      b.byte(OP.localGet);
      b.unsigned(local.index);
      this.convert(local.type, type);
      this.expr(value, type);
      const arithmetic = ARITHMETIC[type] as Record<string, number>;
      b.byte(arithmetic[op[0]]);
      this.convert(type, local.type);
    }
    b.byte(OP.localSet);
    b.unsigned(local.index);
  }

  /** Pushes the address part of an access and returns the offset immediate. */
  private address(array: string, index: Expr): number {
    const base = this.arrays[array];
    if (base === undefined) throw new SubsetError(`an array ${array}`);
    const b = this.body;
    if (index.kind === 'number' && index.integer) {
      // A fixed place: address 0 and the place in the offset immediate.
      b.byte(OP.i32Const);
      b.signed(0);
      return base + 8 * index.value;
    }
    this.expr(index, 'i32');
    b.byte(OP.i32Const);
    b.signed(3);
    b.byte(OP.i32Shl);
    return base;
  }

  private load(array: string, index: Expr): void {
    const at = this.address(array, index);
    this.body.byte(OP.f64Load);
    this.body.unsigned(3);
    this.body.unsigned(at);
  }

  private literal(value: number, type: ValueType): void {
    const b = this.body;
    if (type === 'f64') {
      b.byte(OP.f64Const);
      b.f64(value);
    } else {
      b.byte(OP.i32Const);
      b.signed(value);
    }
  }

  private convert(from: ValueType, to: ValueType): void {
    if (from === to || (from !== 'f64' && to !== 'f64')) return;
    const b = this.body;
    if (to === 'f64') {
      b.byte(OP.f64ConvertI32S);
    } else if (to === 'i32') {
      b.byte(OP.saturatingPrefix);
      b.unsigned(2);
    } else {
      throw new SubsetError('a number used as a condition');
    }
  }

  private typeOf(e: Expr): StaticType {
    switch (e.kind) {
      case 'number':
        return e.integer && Math.abs(e.value) < 2 ** 31 ? 'lit' : 'f64';
      case 'boolean':
        return 'bool';
      case 'name':
        return this.lookup(e.name).type;
      case 'index':
      case 'call':
        return 'f64';
      case 'unary':
        return e.op === '!' ? 'bool' : this.typeOf(e.operand) === 'i32' ? 'i32' : 'f64';
      case 'conditional':
        return join(this.typeOf(e.then), this.typeOf(e.otherwise));
      case 'binary': {
        const a = this.typeOf(e.left);
        const b = this.typeOf(e.right);
        switch (e.op) {
          case '&&':
          case '||':
          case '===':
          case '!==':
          case '<':
          case '>':
          case '<=':
          case '>=':
            return 'bool';
          case '&':
            return a === 'bool' && b === 'bool' ? 'bool' : 'i32';
          case '|':
            return 'i32';
          case '/':
            return 'f64';
          default:
            if (a === 'bool' || b === 'bool') throw new SubsetError(`arithmetic on a boolean (${e.op})`);
            return join(a, b);
        }
      }
    }
  }

  /** Emits `e` leaving a value of type `want` on the stack. */
  private expr(e: Expr, want: ValueType): void {
    const natural = this.typeOf(e);
    const type = concrete(natural, want);
    this.emit(e, type);
    this.convert(type, want);
  }

  /** Emits `e` computed as `type` (its own type, or the wanted one for a literal expression). */
  private emit(e: Expr, type: ValueType): void {
    const b = this.body;
    switch (e.kind) {
      case 'number':
        if (type !== 'f64' && !e.integer) throw new SubsetError(`a fraction ${e.value} as an integer`);
        return this.literal(e.value, type);
      case 'boolean':
        return this.literal(e.value ? 1 : 0, 'i32');
      case 'name': {
        const local = this.lookup(e.name);
        b.byte(OP.localGet);
        b.unsigned(local.index);
        return;
      }
      case 'index':
        return this.load(e.array, e.index);
      case 'call':
        return this.call(e.fn, e.args);
      case 'unary':
        if (e.op === '!') {
          this.expr(e.operand, 'bool');
          b.byte(OP.i32Eqz);
        } else if (type === 'f64') {
          this.expr(e.operand, 'f64');
          b.byte(OP.f64Neg);
        } else {
          this.literal(0, 'i32');
          this.expr(e.operand, 'i32');
          b.byte(OP.i32Sub);
        }
        return;
      case 'conditional':
        this.expr(e.test, 'bool');
        b.byte(OP.if);
        b.byte(WASM_TYPE[type]);
        this.expr(e.then, type);
        b.byte(OP.else);
        this.expr(e.otherwise, type);
        b.byte(OP.end);
        return;
      case 'binary':
        return this.binary(e.op, e.left, e.right, type);
    }
  }

  private binary(op: string, left: Expr, right: Expr, type: ValueType): void {
    const b = this.body;
    switch (op) {
      case '&&':
        this.expr(left, 'bool');
        b.byte(OP.if);
        b.byte(TYPE.i32);
        this.expr(right, 'bool');
        b.byte(OP.else);
        this.literal(0, 'i32');
        b.byte(OP.end);
        return;
      case '||':
        this.expr(left, 'bool');
        b.byte(OP.if);
        b.byte(TYPE.i32);
        this.literal(1, 'i32');
        b.byte(OP.else);
        this.expr(right, 'bool');
        b.byte(OP.end);
        return;
      case '&':
        this.expr(left, 'i32');
        this.expr(right, 'i32');
        b.byte(OP.i32And);
        return;
      case '|':
        if (right.kind === 'number' && right.value === 0) {
          // `x | 0`: the integer a counter stored as a double holds.
          this.expr(left, 'i32');
          return;
        }
        this.expr(left, 'i32');
        this.expr(right, 'i32');
        b.byte(OP.i32Or);
        return;
      case '===':
      case '!==':
      case '<':
      case '>':
      case '<=':
      case '>=': {
        const a = this.typeOf(left);
        const c = this.typeOf(right);
        const operands: 'f64' | 'i32' = a === 'f64' || c === 'f64' || (a === 'lit' && c === 'lit') ? 'f64' : 'i32';
        this.expr(left, operands);
        this.expr(right, operands);
        b.byte(COMPARE[operands][op]);
        return;
      }
      default: {
        if (type === 'bool') throw new SubsetError(`arithmetic ${op} as a boolean`);
        const table = ARITHMETIC[type] as Record<string, number>;
        const code = table[op];
        if (code === undefined) throw new SubsetError(`the operator ${op} on ${type}`);
        this.expr(left, type);
        this.expr(right, type);
        b.byte(code);
      }
    }
  }

  private call(fn: string, args: Expr[]): void {
    const b = this.body;
    const one = (): void => {
      if (args.length !== 1) throw new SubsetError(`Math.${fn} with ${args.length} arguments`);
      this.expr(args[0], 'f64');
    };
    switch (fn) {
      case 'abs':
        one();
        b.byte(OP.f64Abs);
        return;
      case 'sqrt':
        one();
        b.byte(OP.f64Sqrt);
        return;
      case 'exp':
      case 'log':
        one();
        b.byte(OP.call);
        b.unsigned(fn === 'exp' ? 0 : 1);
        return;
      case 'max':
      case 'min': {
        // Math.max(a, b, c) is max(max(a, b), c), NaN and signed zeros alike.
        if (args.length < 2) throw new SubsetError(`Math.${fn} with ${args.length} arguments`);
        this.expr(args[0], 'f64');
        for (let i = 1; i < args.length; i++) {
          this.expr(args[i], 'f64');
          b.byte(fn === 'max' ? OP.f64Max : OP.f64Min);
        }
        return;
      }
      default:
        throw new SubsetError(`Math.${fn}`);
    }
  }
}

/** The type two operands (or the two arms of a conditional) combine to. */
function join(a: StaticType, b: StaticType): StaticType {
  if (a === 'lit' && b === 'lit') return 'lit';
  if (a === b) return a;
  if ((a === 'i32' && b === 'lit') || (a === 'lit' && b === 'i32')) return 'i32';
  if (a === 'bool' || b === 'bool') throw new SubsetError('a boolean mixed with a number');
  return 'f64';
}

function concrete(t: StaticType, want: ValueType): ValueType {
  if (t !== 'lit') return t;
  return want === 'bool' ? 'i32' : want;
}

function describe(t: Target): string {
  return t.kind === 'name' ? t.name : `${t.array}[…]`;
}

