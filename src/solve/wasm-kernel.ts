/**
 * The inner kernel of the symmetric rank-k update (dense.ts, rankUpdate) as a
 * small WebAssembly function using 128-bit SIMD (two doubles per lane pair),
 * assembled here byte by byte from the WebAssembly core specification
 * (W3C WebAssembly Core Specification 2.0, binary format, chapter 5, and its
 * fixed-width SIMD instructions). Plain JavaScript compiles to scalar code
 * with a bounds check per typed-array access; this kernel does two
 * multiply-adds per instruction and no bounds checks, on a WebAssembly
 * memory that holds the frontal matrix and the update stack.
 *
 * rowBlock4(r0, m8, q, nPairs, len, s0, d0, d1, d2, d3), all addresses in bytes:
 *   for p in 0 .. nPairs-1, c in {0, 1}, r in 0..3:
 *     d_r[2p + c] = s_r[2p + c] - sum_{t < len} R_r[t] * Q_{2p+c}[t]
 *   with R_r = r0 + r*m8 (row a+r of the front from column t0),
 *        Q_j = q + j*m8 (row b0+j from column t0),
 *        s_r = s0 + r*m8 (entry (a+r, b0) of the front).
 * This is the 4 x 2 register-blocked body of rankUpdate for a strip of
 * column pairs; the caller handles the remaining columns and rows.
 * Two scalar helpers of the multifrontal method sit beside it (extendAdd,
 * zeroLower), where the JavaScript versions pay a bounds check per access
 * and a call per row.
 */

// --- a minimal assembler ------------------------------------------------------

function uleb(v: number, out: number[]): void {
  let x = v >>> 0;
  do {
    let byte = x & 0x7f;
    x >>>= 7;
    if (x !== 0) byte |= 0x80;
    out.push(byte);
  } while (x !== 0);
}

function sleb(v: number, out: number[]): void {
  let x = v | 0;
  for (;;) {
    const byte = x & 0x7f;
    x >>= 7;
    if ((x === 0 && (byte & 0x40) === 0) || (x === -1 && (byte & 0x40) !== 0)) {
      out.push(byte);
      return;
    }
    out.push(byte | 0x80);
  }
}

function section(id: number, content: number[], out: number[]): void {
  out.push(id);
  uleb(content.length, out);
  out.push(...content);
}

function name(s: string, out: number[]): void {
  uleb(s.length, out);
  for (let i = 0; i < s.length; i++) out.push(s.charCodeAt(i));
}

// opcodes (core specification, section 5.4)
const BLOCK = 0x02;
const LOOP = 0x03;
const IF = 0x04;
const END = 0x0b;
const BR = 0x0c;
const BR_IF = 0x0d;
const VOID = 0x40;
const LOCAL_GET = 0x20;
const LOCAL_SET = 0x21;
const I32_CONST = 0x41;
const I32_GE_S = 0x4e;
const I32_ADD = 0x6a;
const I32_MUL = 0x6c;
const I32_AND = 0x71;
const I32_SHL = 0x74;
const F64_LOAD = 0x2b;
const F64_STORE = 0x39;
const F64_ADD = 0xa0;
const F64_SUB = 0xa1;
const F64_MUL = 0xa2;
const SIMD = 0xfd;
const V128_LOAD = 0x00;
const V128_CONST = 0x0c;
const F64X2_EXTRACT_LANE = 0x21;
const F64X2_ADD = 0xf0;
const F64X2_MUL = 0xf2;
const T_I32 = 0x7f;
const T_F64 = 0x7c;
const T_V128 = 0x7b;

class Code {
  readonly bytes: number[] = [];
  op(...b: number[]): this {
    this.bytes.push(...b);
    return this;
  }
  get(i: number): this {
    this.bytes.push(LOCAL_GET);
    uleb(i, this.bytes);
    return this;
  }
  set(i: number): this {
    this.bytes.push(LOCAL_SET);
    uleb(i, this.bytes);
    return this;
  }
  i32(v: number): this {
    this.bytes.push(I32_CONST);
    sleb(v, this.bytes);
    return this;
  }
  simd(op: number): this {
    this.bytes.push(SIMD);
    uleb(op, this.bytes);
    return this;
  }
  v128Load(offset = 0): this {
    this.simd(V128_LOAD);
    this.bytes.push(3); // alignment hint 2^3; unaligned access is allowed
    uleb(offset, this.bytes);
    return this;
  }
  f64Load(offset = 0): this {
    this.bytes.push(F64_LOAD, 3);
    uleb(offset, this.bytes);
    return this;
  }
  f64Store(offset = 0): this {
    this.bytes.push(F64_STORE, 3);
    uleb(offset, this.bytes);
    return this;
  }
  v128Zero(): this {
    this.simd(V128_CONST);
    for (let i = 0; i < 16; i++) this.bytes.push(0);
    return this;
  }
  lane(l: number): this {
    this.simd(F64X2_EXTRACT_LANE);
    this.bytes.push(l);
    return this;
  }
}

// parameter and local indices
const P_R0 = 0;
const P_M8 = 1;
const P_Q = 2;
const P_NPAIRS = 3;
const P_LEN = 4;
const P_S0 = 5;
const P_D = [6, 7, 8, 9];
const L_R = [P_R0, 10, 11, 12];
const L_Q0 = 13;
const L_Q1 = 14;
const L_T = 15;
const L_TEND = 16;
const L_PAIR = 17;
const L_BOFF = 18;
const L_S = [P_S0, 19, 20, 21];
const N_I32 = 12; // locals 10 .. 21
const V_ACC = 22; // acc[r][c] = 22 + 2r + c
const V_X = 30;
const V_Y0 = 31;
const V_Y1 = 32;
const N_V128 = 11;
const F_S = 33; // scalar sum (r, c) = 33 + 2r + c
const F_X = 41;
const F_Y0 = 42;
const F_Y1 = 43;
const N_F64 = 11;

function rowBlock4Body(): number[] {
  const c = new Code();
  // row and source addresses of rows 1..3
  for (let r = 1; r < 4; r++) {
    c.get(L_R[r - 1]).get(P_M8).op(I32_ADD).set(L_R[r]);
    c.get(L_S[r - 1]).get(P_M8).op(I32_ADD).set(L_S[r]);
  }
  // tEnd = (len & ~1) * 8
  c.get(P_LEN).i32(-2).op(I32_AND).i32(3).op(I32_SHL).set(L_TEND);
  c.i32(0).set(L_PAIR);
  c.op(BLOCK, VOID, LOOP, VOID);
  {
    c.get(L_PAIR).get(P_NPAIRS).op(I32_GE_S, BR_IF, 1);
    c.get(L_PAIR).i32(4).op(I32_SHL).set(L_BOFF);
    // q0 = q + 2*pair*m8, q1 = q0 + m8
    c.get(P_Q).get(L_PAIR).i32(1).op(I32_SHL).get(P_M8).op(I32_MUL, I32_ADD).set(L_Q0);
    c.get(L_Q0).get(P_M8).op(I32_ADD).set(L_Q1);
    for (let k = 0; k < 8; k++) c.v128Zero().set(V_ACC + k);
    c.i32(0).set(L_T);
    c.op(BLOCK, VOID, LOOP, VOID);
    {
      c.get(L_T).get(L_TEND).op(I32_GE_S, BR_IF, 1);
      c.get(L_Q0).get(L_T).op(I32_ADD).v128Load().set(V_Y0);
      c.get(L_Q1).get(L_T).op(I32_ADD).v128Load().set(V_Y1);
      for (let r = 0; r < 4; r++) {
        c.get(L_R[r]).get(L_T).op(I32_ADD).v128Load().set(V_X);
        c.get(V_ACC + 2 * r).get(V_X).get(V_Y0).simd(F64X2_MUL).simd(F64X2_ADD).set(V_ACC + 2 * r);
        c.get(V_ACC + 2 * r + 1).get(V_X).get(V_Y1).simd(F64X2_MUL).simd(F64X2_ADD).set(V_ACC + 2 * r + 1);
      }
      c.get(L_T).i32(16).op(I32_ADD).set(L_T);
      c.op(BR, 0);
    }
    c.op(END, END);
    // horizontal sums
    for (let k = 0; k < 8; k++) c.get(V_ACC + k).lane(0).get(V_ACC + k).lane(1).op(F64_ADD).set(F_S + k);
    // odd length: one scalar step at t = tEnd
    c.get(P_LEN).i32(1).op(I32_AND, IF, VOID);
    {
      c.get(L_Q0).get(L_TEND).op(I32_ADD).f64Load().set(F_Y0);
      c.get(L_Q1).get(L_TEND).op(I32_ADD).f64Load().set(F_Y1);
      for (let r = 0; r < 4; r++) {
        c.get(L_R[r]).get(L_TEND).op(I32_ADD).f64Load().set(F_X);
        c.get(F_S + 2 * r).get(F_X).get(F_Y0).op(F64_MUL, F64_ADD).set(F_S + 2 * r);
        c.get(F_S + 2 * r + 1).get(F_X).get(F_Y1).op(F64_MUL, F64_ADD).set(F_S + 2 * r + 1);
      }
    }
    c.op(END);
    // d_r[2p + col] = s_r[2p + col] - sum
    for (let r = 0; r < 4; r++) {
      for (let col = 0; col < 2; col++) {
        c.get(P_D[r]).get(L_BOFF).op(I32_ADD);
        c.get(L_S[r]).get(L_BOFF).op(I32_ADD).f64Load(8 * col);
        c.get(F_S + 2 * r + col).op(F64_SUB);
        c.f64Store(8 * col);
      }
    }
    c.get(L_PAIR).i32(1).op(I32_ADD).set(L_PAIR);
    c.op(BR, 0);
  }
  c.op(END, END);
  c.op(END); // function end
  const body: number[] = [];
  const locals = [
    [N_I32, T_I32],
    [N_V128, T_V128],
    [N_F64, T_F64],
  ];
  uleb(locals.length, body);
  for (const [count, type] of locals) {
    uleb(count, body);
    body.push(type);
  }
  body.push(...c.bytes);
  return body;
}

/**
 * extendAdd(F, m8, U, rel, mc): for a < mc, b <= a:
 *   F[rel[a]*m8 + rel[b]*8] += U[(a(a+1)/2 + b) * 8]   (byte addresses; rel holds i32)
 * the extend-add of a packed child update matrix into the row-major front.
 */
function extendAddBody(): number[] {
  const P_F = 0;
  const P_M8b = 1;
  const P_U = 2;
  const P_REL = 3;
  const P_MC = 4;
  const L_A = 5;
  const L_B = 6;
  const L_ROW = 7;
  const L_UP = 8;
  const L_ADDR = 9;
  const I32_LOAD = 0x28;
  const I32_GT_S = 0x4a;
  const c = new Code();
  c.get(P_U).set(L_UP);
  c.i32(0).set(L_A);
  c.op(BLOCK, VOID, LOOP, VOID);
  {
    c.get(L_A).get(P_MC).op(I32_GE_S, BR_IF, 1);
    // row = F + rel[a] * m8
    c.get(P_F).get(P_REL).get(L_A).i32(2).op(I32_SHL, I32_ADD, I32_LOAD, 2, 0).get(P_M8b).op(I32_MUL, I32_ADD).set(L_ROW);
    c.i32(0).set(L_B);
    c.op(BLOCK, VOID, LOOP, VOID);
    {
      c.get(L_B).get(L_A).op(I32_GT_S, BR_IF, 1);
      // addr = row + rel[b] * 8
      c.get(L_ROW).get(P_REL).get(L_B).i32(2).op(I32_SHL, I32_ADD, I32_LOAD, 2, 0).i32(3).op(I32_SHL, I32_ADD).set(L_ADDR);
      c.get(L_ADDR).get(L_ADDR).f64Load().get(L_UP).f64Load().op(F64_ADD).f64Store();
      c.get(L_UP).i32(8).op(I32_ADD).set(L_UP);
      c.get(L_B).i32(1).op(I32_ADD).set(L_B);
      c.op(BR, 0);
    }
    c.op(END, END);
    c.get(L_A).i32(1).op(I32_ADD).set(L_A);
    c.op(BR, 0);
  }
  c.op(END, END);
  c.op(END);
  const body: number[] = [];
  uleb(1, body);
  uleb(5, body);
  body.push(T_I32);
  body.push(...c.bytes);
  return body;
}

/**
 * zeroLower(F, m8): zeroes entries 0..a of each row a < m of the row-major
 * front at byte address F with row stride m8 bytes (memory.fill per row).
 */
function zeroLowerBody(): number[] {
  const P_F = 0;
  const P_M8b = 1;
  const L_A8 = 2; // (a+1) * 8, the byte length of row a's lower part
  const L_ROW = 3;
  const I32_LE_S = 0x4c;
  const c = new Code();
  c.get(P_F).set(L_ROW);
  c.i32(8).set(L_A8);
  c.op(BLOCK, VOID, LOOP, VOID);
  {
    c.get(L_A8).get(P_M8b).op(I32_LE_S, 0x45 /* i32.eqz */, BR_IF, 1);
    c.get(L_ROW).i32(0).get(L_A8).op(0xfc, 0x0b, 0x00); // memory.fill
    c.get(L_ROW).get(P_M8b).op(I32_ADD).set(L_ROW);
    c.get(L_A8).i32(8).op(I32_ADD).set(L_A8);
    c.op(BR, 0);
  }
  c.op(END, END);
  c.op(END);
  const body: number[] = [];
  uleb(1, body);
  uleb(2, body);
  body.push(T_I32);
  body.push(...c.bytes);
  return body;
}

/** The binary module (rowBlock4, extendAdd, zeroLower; memory imported as env.mem). */
export function wasmModuleBytes(): Uint8Array {
  const out: number[] = [0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00];
  // type section: 0 = (i32 x 10) -> (), 1 = (i32 x 5) -> (), 2 = (i32 x 2) -> ()
  const types: number[] = [3];
  for (const arity of [10, 5, 2]) {
    types.push(0x60, arity);
    for (let i = 0; i < arity; i++) types.push(T_I32);
    types.push(0);
  }
  section(1, types, out);
  // import section: env.mem, a memory with minimum 1 page
  const imports: number[] = [1];
  name('env', imports);
  name('mem', imports);
  imports.push(0x02, 0x00, 0x01);
  section(2, imports, out);
  section(3, [3, 0, 1, 2], out); // three functions of types 0, 1, 2
  const exports: number[] = [3];
  name('rowBlock4', exports);
  exports.push(0x00, 0x00);
  name('extendAdd', exports);
  exports.push(0x00, 0x01);
  name('zeroLower', exports);
  exports.push(0x00, 0x02);
  section(7, exports, out);
  const code: number[] = [3];
  for (const body of [rowBlock4Body(), extendAddBody(), zeroLowerBody()]) {
    uleb(body.length, code);
    code.push(...body);
  }
  section(10, code, out);
  return Uint8Array.from(out);
}

export type RowBlock4 = (
  r0: number,
  m8: number,
  q: number,
  nPairs: number,
  len: number,
  s0: number,
  d0: number,
  d1: number,
  d2: number,
  d3: number,
) => void;

// The project compiles against ES2022 and Node types only, which do not
// declare the WebAssembly global: the few members used are declared here.
interface WasmMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}
interface WasmApi {
  validate(bytes: Uint8Array): boolean;
  Memory: new (d: { initial: number; maximum?: number }) => WasmMemory;
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
}
const wasmApi = (globalThis as unknown as { WebAssembly?: WasmApi }).WebAssembly;

export type ExtendAdd = (f: number, m8: number, u: number, rel: number, mc: number) => void;
export type ZeroLower = (f: number, m8: number) => void;

/** A WebAssembly memory with the compiled kernels; grows on demand. */
class WasmHeap {
  readonly memory: WasmMemory;
  readonly rowBlock4: RowBlock4;
  readonly extendAdd: ExtendAdd;
  readonly zeroLower: ZeroLower;
  private view: Float64Array;

  private constructor(memory: WasmMemory, exports: Record<string, unknown>) {
    this.memory = memory;
    this.rowBlock4 = exports.rowBlock4 as RowBlock4;
    this.extendAdd = exports.extendAdd as ExtendAdd;
    this.zeroLower = exports.zeroLower as ZeroLower;
    this.view = new Float64Array(memory.buffer);
  }

  /** Returns a heap, or null when this JavaScript engine lacks WebAssembly SIMD. */
  static create(): WasmHeap | null {
    if (wasmApi === undefined) return null;
    const bytes = wasmModuleBytes();
    if (!wasmApi.validate(bytes)) return null;
    let memory: WasmMemory;
    try {
      memory = new wasmApi.Memory({ initial: 1 });
    } catch {
      // V8 reserves about 10 GB of address space for every WebAssembly memory (guard pages that
      // spare it bounds checks); under a smaller virtual memory limit (ulimit -v) that fails.
      // The JavaScript kernel computes the same factor, more slowly.
      return null;
    }
    const instance = new wasmApi.Instance(new wasmApi.Module(bytes), { env: { mem: memory } });
    return new WasmHeap(memory, instance.exports);
  }

  /**
   * A Float64Array over the heap with at least `doubles` entries, or null if
   * the memory cannot grow that far (WebAssembly 32-bit memories stop at 4 GiB).
   */
  reserve(doubles: number): Float64Array | null {
    const bytes = doubles * 8;
    if (bytes > 2 ** 32 - 65536) return null;
    const have = this.memory.buffer.byteLength;
    if (bytes > have) {
      try {
        this.memory.grow(Math.ceil((bytes - have) / 65536));
      } catch {
        return null;
      }
    }
    if (this.view.buffer !== this.memory.buffer) this.view = new Float64Array(this.memory.buffer);
    return this.view;
  }
}

let shared: WasmHeap | null | undefined;

/** The process-wide heap (created on first use), or null without WebAssembly SIMD. */
export function sharedWasmHeap(): WasmHeap | null {
  if (shared === undefined) shared = WasmHeap.create();
  return shared;
}

/** True when the SIMD kernel compiles on this engine. */
export function wasmKernelAvailable(): boolean {
  return sharedWasmHeap() !== null;
}
