/**
 * A probe, not a product path: is a WebAssembly SIMD stage both bit-identical to the JavaScript one and
 * faster? It emits (by hand, no toolchain) the radix-8 and radix-16 Stockham stages of
 * src/dsp/fft/butterflies.ts with f64x2 lanes: each lane does the scalar stage's additions,
 * subtractions and multiplications in the same order, and WebAssembly never fuses a multiply and an add,
 * so every output must carry the same bits. Two lane layouts:
 * - "q": lanes hold sub-transforms q and q + 1 of one transform (stages of stride ≥ 2);
 * - "pair": lanes hold element k of two transforms of the same length, interleaved (any stage, also the
 *   first, of stride 1), as two frequencies of one Morlet length would be.
 * It checks the bits at the radix-8 and radix-16 stages of the Morlet lengths (1152, 1280, 1536, 2048),
 * full and with the rows cut as the last stage cuts them, and times both in CPU ns per point of one
 * transform (best of 5 rounds, since the machine is shared).
 *
 * Standalone: `npx tsx bench/fft-simd-probe.ts`. Prints figures; exits 1 only if the bits differ.
 */
import { pathToFileURL } from 'node:url';
import { radix16, radix8 } from '../src/dsp/fft/butterflies.js';
import { factorize, makeStages } from '../src/dsp/fft/factorization.js';
// ---- tiny wasm emitter ----
const uleb = (n: number) => {
  const o: number[] = [];
  do {
    let b = n & 0x7f;
    n >>>= 7;
    if (n) b |= 0x80;
    o.push(b);
  } while (n);
  return o;
};
const sleb = (n: number) => {
  const o: number[] = [];
  for (;;) {
    const b = n & 0x7f;
    n >>= 7;
    if ((n === 0 && !(b & 0x40)) || (n === -1 && b & 0x40)) {
      o.push(b);
      return o;
    }
    o.push(b | 0x80);
  }
};
const section = (id: number, body: number[]) => [id, ...uleb(body.length), ...body];
const vec = (items: number[][]) => [...uleb(items.length), ...items.flat()];
const str = (s: string) => [...uleb(s.length), ...[...s].map((c) => c.charCodeAt(0))];
/** A local of the emitted function: an i32 (addresses, counters) or a v128 (two f64 lanes). */
type Local = { k: 'v' | 'i'; i: number };
class Fn {
  code: number[] = [];
  nV = 0;
  nI = 0;
  params: number;
  constructor(params: number) {
    this.params = params;
  }
  vloc() {
    return { k: 'v' as const, i: this.nV++ };
  }
  iloc() {
    return { k: 'i' as const, i: this.nI++ };
  }
  idx(l: { k: 'v' | 'i'; i: number }) {
    return l.k === 'i' ? this.params + l.i : this.params + 64 + l.i;
  } // i32 locals first (64 reserved)
}
// opcodes
const I32_CONST = 0x41,
  LGET = 0x20,
  LSET = 0x21,
  I32_ADD = 0x6a,
  I32_MUL = 0x6c,
  I32_SHL = 0x74,
  I32_LTU = 0x49,
  I32_EQZ = 0x45;
const SIMD = 0xfd;
const simd = (op: number) => [SIMD, ...uleb(op)];
const V_LOAD = 0,
  V_STORE = 11,
  V_LOAD64_SPLAT = 10,
  F64X2_ADD = 240,
  F64X2_SUB = 241,
  F64X2_MUL = 242,
  F64X2_NEG = 237,
  F64X2_SPLAT = 20;

type V = { k: 'v'; i: number };
/** Emits the body of one butterfly: `lower` (outputs t < rows cut) and `upper` (the rest) as [re, im] per t. */
interface Butterfly {
  radix: number;
  /** outputs t ≥ cut are computed only when rows > cut, as in butterflies.ts */
  cut: number;
  body(ops: Ops, ar: V[], ai: V[]): { lower: () => [V, V][]; upper: () => [V, V][] };
}
interface Ops {
  add(x: V, y: V): V;
  sub(x: V, y: V): V;
  mul(x: V, y: V): V;
  neg(x: V): V;
  constant(value: number): V;
}

/**
 * One Stockham stage as a function (s, m, xr, xi, yr, yi, tw, rows), byte addresses into the memory;
 * `element` is 8 (lanes over q, q stepping by 2) or 16 (two interleaved transforms, q stepping by 1).
 */
function buildStage(butterfly: Butterfly, element: 8 | 16): Uint8Array {
  const P = 8;
  const f = new Fn(P);
  const c = f.code;
  const get = (i: number) => c.push(LGET, ...uleb(i));
  const set = (i: number) => c.push(LSET, ...uleb(i));
  const iconst = (v: number) => c.push(I32_CONST, ...sleb(v));
  const L = (l: Local) => f.idx(l);
  const [S, M, XR, XI, YR, YI, TW, ROWS] = [0, 1, 2, 3, 4, 5, 6, 7];
  const p = butterfly.radix;
  const j = f.iloc(),
    q = f.iloc(),
    smE = f.iloc(),
    inB = f.iloc(),
    outB = f.iloc(),
    t = f.iloc(),
    a = f.iloc(),
    o = f.iloc(),
    sE = f.iloc();
  const shift = element === 8 ? 3 : 4;
  // smE = s·m·element, sE = s·element (bytes)
  get(S);
  get(M);
  c.push(I32_MUL);
  iconst(shift);
  c.push(I32_SHL);
  set(L(smE));
  get(S);
  iconst(shift);
  c.push(I32_SHL);
  set(L(sE));
  const bin = (op: number, x: V, y: V): V => {
    const r = f.vloc();
    get(L(x));
    get(L(y));
    c.push(...simd(op));
    set(L(r));
    return r;
  };
  const ops: Ops = {
    add: (x, y) => bin(F64X2_ADD, x, y),
    sub: (x, y) => bin(F64X2_SUB, x, y),
    mul: (x, y) => bin(F64X2_MUL, x, y),
    neg: (x) => {
      const r = f.vloc();
      get(L(x));
      c.push(...simd(F64X2_NEG));
      set(L(r));
      return r;
    },
    constant: (value) => {
      const r = f.vloc();
      c.push(0x44, ...new Uint8Array(new Float64Array([value]).buffer));
      c.push(...simd(F64X2_SPLAT));
      set(L(r));
      return r;
    },
  };
  const memarg = (offset: number) => [3, ...uleb(offset)]; // align 2^3
  const load = (base: number, addr: Local): V => {
    const r = f.vloc();
    get(base);
    get(L(addr));
    c.push(I32_ADD);
    c.push(...simd(V_LOAD), ...memarg(0));
    set(L(r));
    return r;
  };
  const store = (base: number, addr: Local, v: V) => {
    get(base);
    get(L(addr));
    c.push(I32_ADD);
    get(L(v));
    c.push(...simd(V_STORE), ...memarg(0));
  };
  iconst(0);
  set(L(j));
  c.push(0x02, 0x40, 0x03, 0x40); // block, loop over j
  get(L(j));
  get(M);
  c.push(I32_LTU, I32_EQZ, 0x0d, 1);
  // t = tw + (p − 1)·16·j: the twiddles ω^{j·t}, t = 1..p−1, as (re, im) f64 pairs
  get(TW);
  get(L(j));
  iconst((p - 1) * 16);
  c.push(I32_MUL, I32_ADD);
  set(L(t));
  const wv: V[] = [];
  for (let k = 0; k < 2 * (p - 1); k++) {
    const r = f.vloc();
    get(L(t));
    c.push(...simd(V_LOAD64_SPLAT), ...memarg(8 * k));
    set(L(r));
    wv.push(r);
  }
  get(L(sE));
  get(L(j));
  c.push(I32_MUL);
  set(L(inB));
  get(L(inB));
  iconst(Math.log2(p));
  c.push(I32_SHL);
  set(L(outB));
  iconst(0);
  set(L(q));
  c.push(0x02, 0x40, 0x03, 0x40); // block, loop over q (16 bytes: two lanes)
  get(L(q));
  get(L(sE));
  c.push(I32_LTU, I32_EQZ, 0x0d, 1);
  get(L(inB));
  get(L(q));
  c.push(I32_ADD);
  set(L(a));
  const ar: V[] = [],
    ai: V[] = [];
  for (let r = 0; r < p; r++) {
    if (r > 0) {
      get(L(a));
      get(L(smE));
      c.push(I32_ADD);
      set(L(a));
    }
    ar.push(load(XR, a));
    ai.push(load(XI, a));
  }
  const { lower, upper } = butterfly.body(ops, ar, ai);
  get(L(outB));
  get(L(q));
  c.push(I32_ADD);
  set(L(o));
  let row = 0;
  const emit = ([xr, xi]: [V, V]) => {
    // output row 0 is not twiddled; row k by ω^{j·k}: x·w as in butterflies.ts
    let yr = xr,
      yi = xi;
    if (row > 0) {
      const wr = wv[2 * row - 2]!,
        wi = wv[2 * row - 1]!;
      yr = ops.sub(ops.mul(xr, wr), ops.mul(xi, wi));
      yi = ops.add(ops.mul(xr, wi), ops.mul(xi, wr));
    }
    store(YR, o, yr);
    store(YI, o, yi);
    get(L(o));
    get(L(sE));
    c.push(I32_ADD);
    set(L(o));
    row++;
  };
  for (const pair of lower()) emit(pair);
  get(ROWS);
  iconst(butterfly.cut);
  c.push(0x4a, 0x04, 0x40); // if rows > cut
  for (const pair of upper()) emit(pair);
  c.push(0x0b);
  get(L(q));
  iconst(16);
  c.push(I32_ADD);
  set(L(q));
  c.push(0x0c, 0, 0x0b, 0x0b);
  get(L(j));
  iconst(1);
  c.push(I32_ADD);
  set(L(j));
  c.push(0x0c, 0, 0x0b, 0x0b);
  c.push(0x0b); // end of the function
  const locals = [
    [...uleb(64), 0x7f],
    [...uleb(f.nV), 0x7b],
  ];
  const body = [...vec(locals), ...c];
  const bytes = [
    ...[0x00, 0x61, 0x73, 0x6d, 1, 0, 0, 0],
    ...section(1, vec([[0x60, ...vec(Array(P).fill([0x7f])), 0]])),
    ...section(2, vec([[...str('m'), ...str('mem'), 0x02, 0x00, ...uleb(64)]])),
    ...section(3, vec([[0]])),
    ...section(7, vec([[...str('stage'), 0, 0]])),
    ...section(10, vec([[...uleb(body.length), ...body]])),
  ];
  return new Uint8Array(bytes);
}

/** DFT4 of (x0, x1, x2, x3) as butterflies.ts writes it: [X0, X1, X2, X3] as [re, im]. */
function dft4(o: Ops, x0r: V, x0i: V, x1r: V, x1i: V, x2r: V, x2i: V, x3r: V, x3i: V): [V, V][] {
  const u0r = o.add(x0r, x2r),
    u0i = o.add(x0i, x2i),
    u1r = o.sub(x0r, x2r),
    u1i = o.sub(x0i, x2i);
  const u2r = o.add(x1r, x3r),
    u2i = o.add(x1i, x3i),
    u3r = o.sub(x1r, x3r),
    u3i = o.sub(x1i, x3i);
  return [
    [o.add(u0r, u2r), o.add(u0i, u2i)],
    [o.add(u1r, u3i), o.sub(u1i, u3r)],
    [o.sub(u0r, u2r), o.sub(u0i, u2i)],
    [o.sub(u1r, u3i), o.add(u1i, u3r)],
  ];
}

const RADIX8: Butterfly = {
  radix: 8,
  cut: 4,
  body(o, a, b) {
    const h = o.constant(Math.SQRT1_2);
    // E = DFT4(a0, a2, a4, a6), O = DFT4(a1, a3, a5, a7), with the a_r + a_{r+4} sums first
    const [e0, e1, e2, e3] = dft4(o, a[0]!, b[0]!, a[2]!, b[2]!, a[4]!, b[4]!, a[6]!, b[6]!) as [[V, V], [V, V], [V, V], [V, V]];
    const [o0, o1, o2, o3] = dft4(o, a[1]!, b[1]!, a[3]!, b[3]!, a[5]!, b[5]!, a[7]!, b[7]!) as [[V, V], [V, V], [V, V], [V, V]];
    const r1r = o.mul(h, o.add(o1[0], o1[1])),
      r1i = o.mul(h, o.sub(o1[1], o1[0]));
    const r3r = o.mul(h, o.sub(o3[1], o3[0])),
      r3i = o.mul(o.neg(h), o.add(o3[0], o3[1]));
    return {
      lower: () => [
        [o.add(e0[0], o0[0]), o.add(e0[1], o0[1])],
        [o.add(e1[0], r1r), o.add(e1[1], r1i)],
        [o.add(e2[0], o2[1]), o.sub(e2[1], o2[0])],
        [o.add(e3[0], r3r), o.add(e3[1], r3i)],
      ],
      upper: () => [
        [o.sub(e0[0], o0[0]), o.sub(e0[1], o0[1])],
        [o.sub(e1[0], r1r), o.sub(e1[1], r1i)],
        [o.sub(e2[0], o2[1]), o.add(e2[1], o2[0])],
        [o.sub(e3[0], r3r), o.sub(e3[1], r3i)],
      ],
    };
  },
};

const RADIX16: Butterfly = {
  radix: 16,
  cut: 8,
  body(o, a, b) {
    const h = o.constant(Math.SQRT1_2),
      cc = o.constant(Math.cos(Math.PI / 8)),
      d = o.constant(Math.sin(Math.PI / 8));
    const col = (r: number) => dft4(o, a[r]!, b[r]!, a[r + 4]!, b[r + 4]!, a[r + 8]!, b[r + 8]!, a[r + 12]!, b[r + 12]!) as [[V, V], [V, V], [V, V], [V, V]];
    const c0 = col(0);
    const b1 = col(1);
    const c1: [V, V][] = [
      b1[0],
      [o.add(o.mul(b1[1][0], cc), o.mul(b1[1][1], d)), o.sub(o.mul(b1[1][1], cc), o.mul(b1[1][0], d))],
      [o.mul(h, o.add(b1[2][0], b1[2][1])), o.mul(h, o.sub(b1[2][1], b1[2][0]))],
      [o.add(o.mul(b1[3][0], d), o.mul(b1[3][1], cc)), o.sub(o.mul(b1[3][1], d), o.mul(b1[3][0], cc))],
    ];
    const b2 = col(2);
    const c2: [V, V][] = [
      b2[0],
      [o.mul(h, o.add(b2[1][0], b2[1][1])), o.mul(h, o.sub(b2[1][1], b2[1][0]))],
      [b2[2][1], o.neg(b2[2][0])],
      [o.mul(h, o.sub(b2[3][1], b2[3][0])), o.mul(o.neg(h), o.add(b2[3][0], b2[3][1]))],
    ];
    const b3 = col(3);
    const c3: [V, V][] = [
      b3[0],
      [o.add(o.mul(b3[1][0], d), o.mul(b3[1][1], cc)), o.sub(o.mul(b3[1][1], d), o.mul(b3[1][0], cc))],
      [o.mul(h, o.sub(b3[2][1], b3[2][0])), o.mul(o.neg(h), o.add(b3[2][0], b3[2][1]))],
      [o.neg(o.add(o.mul(cc, b3[3][0]), o.mul(d, b3[3][1]))), o.sub(o.mul(d, b3[3][0]), o.mul(cc, b3[3][1]))],
    ];
    // X_(k + 4·t2) = DFT4(c_0k, c_1k, c_2k, c_3k)[t2]: v_k0..3 are its sums and differences
    const v = [0, 1, 2, 3].map((k) => {
      const [x0, x1, x2, x3] = [c0[k]!, c1[k]!, c2[k]!, c3[k]!];
      return [
        [o.add(x0[0], x2[0]), o.add(x0[1], x2[1])],
        [o.sub(x0[0], x2[0]), o.sub(x0[1], x2[1])],
        [o.add(x1[0], x3[0]), o.add(x1[1], x3[1])],
        [o.sub(x1[0], x3[0]), o.sub(x1[1], x3[1])],
      ] as [V, V][];
    });
    return {
      lower: () => [...v.map((w) => [o.add(w[0]![0], w[2]![0]), o.add(w[0]![1], w[2]![1])] as [V, V]), ...v.map((w) => [o.add(w[1]![0], w[3]![1]), o.sub(w[1]![1], w[3]![0])] as [V, V])],
      upper: () => [...v.map((w) => [o.sub(w[0]![0], w[2]![0]), o.sub(w[0]![1], w[2]![1])] as [V, V]), ...v.map((w) => [o.sub(w[1]![0], w[3]![1]), o.add(w[1]![1], w[3]![0])] as [V, V])],
    };
  },
};

/** The few WebAssembly globals used here (the project's TypeScript libraries do not declare them). */
interface WasmApi {
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer };
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
}
const wasm = (globalThis as unknown as { WebAssembly: WasmApi }).WebAssembly;

type StageFn = (s: number, m: number, xr: Float64Array, xi: Float64Array, yr: Float64Array, yi: Float64Array, tw: Float64Array, rows: number) => void;

/** Runs the probe and returns printable lines and whether every compared output had the same bits. */
export function probeSimdStages(): { lines: string[]; identical: boolean } {
  const memory = new wasm.Memory({ initial: 64 });
  const cpu = (): number => {
    const c = process.cpuUsage();
    return (c.user + c.system) / 1e6;
  };
  const kinds = [
    { butterfly: RADIX8, js: radix8 as StageFn },
    { butterfly: RADIX16, js: radix16 as StageFn },
  ];
  const built = new Map<string, (...args: number[]) => void>();
  const stageOf = (butterfly: Butterfly, element: 8 | 16) => {
    const key = `${butterfly.radix}/${element}`;
    let fn = built.get(key);
    if (fn === undefined) {
      const instance = new wasm.Instance(new wasm.Module(buildStage(butterfly, element)), { m: { mem: memory } });
      fn = instance.exports.stage as (...args: number[]) => void;
      built.set(key, fn);
    }
    return fn;
  };
  const lines = ['fft SIMD probe: JavaScript stage vs WebAssembly f64x2, CPU ns per point of one transform, best of 5'];
  let identical = true;
  for (const L of [1152, 1280, 1536, 2048]) {
    for (const st of makeStages(L, factorize(L))) {
      const kind = kinds.find((k) => k.butterfly.radix === st.radix);
      if (kind === undefined) continue;
      const { butterfly, js } = kind;
      for (const element of [8, 16] as const) {
        if (element === 8 && st.stride % 2 !== 0) continue; // lanes over q need an even stride
        const count = element === 16 ? 2 : 1; // transforms per call
        const heap = new Float64Array(memory.buffer);
        const words = L * count;
        const [XR, XI, YR, YI, TW] = [0, 1, 2, 3, 4].map((k) => k * words * 8) as [number, number, number, number, number];
        const view = (at: number) => heap.subarray(at / 8, at / 8 + words);
        const [xr, xi, yr, yi] = [XR, XI, YR, YI].map(view) as [Float64Array, Float64Array, Float64Array, Float64Array];
        heap.set(st.twiddles, TW / 8);
        // transform c's element i at i·count + c
        const sr = [0, 1].map((c) => Float64Array.from({ length: L }, (_, i) => Math.sin(i * (1.7 + c)) * 3));
        const si = [0, 1].map((c) => Float64Array.from({ length: L }, (_, i) => Math.cos(i * (0.3 + c)) - 0.2));
        for (let c = 0; c < count; c++) {
          for (let i = 0; i < L; i++) {
            xr[i * count + c] = sr[c]![i]!;
            xi[i * count + c] = si[c]![i]!;
          }
        }
        const jr = new Float64Array(L),
          ji = new Float64Array(L);
        const simdStage = stageOf(butterfly, element);
        let same = true;
        for (const rows of [st.radix, butterfly.cut]) {
          yr.fill(0);
          yi.fill(0);
          simdStage(st.stride, st.span, XR, XI, YR, YI, TW, rows);
          for (let c = 0; c < count; c++) {
            jr.fill(0);
            ji.fill(0);
            js(st.stride, st.span, sr[c]!, si[c]!, jr, ji, st.twiddles, rows);
            for (let i = 0; i < L; i++) {
              if (!Object.is(jr[i], yr[i * count + c]) || !Object.is(ji[i], yi[i * count + c])) same = false;
            }
          }
        }
        identical &&= same;
        let jsNs = Infinity,
          simdNs = Infinity;
        for (let round = 0; round < 5; round++) {
          const reps = 10000;
          let t0 = cpu();
          for (let r = 0; r < reps; r++) js(st.stride, st.span, sr[0]!, si[0]!, jr, ji, st.twiddles, st.radix);
          jsNs = Math.min(jsNs, ((cpu() - t0) / reps / L) * 1e9);
          t0 = cpu();
          for (let r = 0; r < reps; r++) simdStage(st.stride, st.span, XR, XI, YR, YI, TW, st.radix);
          simdNs = Math.min(simdNs, ((cpu() - t0) / reps / (L * count)) * 1e9);
        }
        const lanes = element === 8 ? 'lanes q, q+1' : 'lanes = 2 transforms';
        lines.push(
          `  n = ${L}, radix ${st.radix}, stride ${st.stride}, ${lanes}: JavaScript ${jsNs.toFixed(2)}, f64x2 ${simdNs.toFixed(2)} (${(jsNs / simdNs).toFixed(2)}×), bits ${same ? 'identical' : 'DIFFERENT'}`,
        );
      }
    }
  }
  return { lines, identical };
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { lines, identical } = probeSimdStages();
  for (const line of lines) console.log(line);
  if (!identical) process.exitCode = 1;
}
