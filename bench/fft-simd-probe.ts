/**
 * A probe, not a product path: is a WebAssembly SIMD stage both bit-identical to the JavaScript one and
 * faster? It emits (by hand, no toolchain) the radix-8 Stockham stage of src/dsp/fft/butterflies.ts
 * with f64x2 lanes holding sub-transforms q and q + 1: each lane does the scalar stage's additions,
 * subtractions and multiplications in the same order, and WebAssembly never fuses a multiply and an add,
 * so every output must carry the same bits. It checks that at the radix-8 stages of the Morlet lengths
 * (1152, 1536, 2048), full and with the last stage's rows cut to 4, and times both stages in CPU ns per
 * point (best of 5 rounds, since the machine is shared).
 *
 * Standalone: `npx tsx bench/fft-simd-probe.ts`. Prints figures; exits 1 only if the bits differ.
 */
import { pathToFileURL } from 'node:url';
import { radix8 } from '../src/dsp/fft/butterflies.js';
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

function buildRadix8(): Uint8Array {
  // params: s, m, xr, xi, yr, yi, tw (byte addresses), rows
  const P = 8;
  const f = new Fn(P);
  const c = f.code;
  const get = (i: number) => c.push(LGET, ...uleb(i));
  const set = (i: number) => c.push(LSET, ...uleb(i));
  const iconst = (v: number) => c.push(I32_CONST, ...sleb(v));
  const [S, M, XR, XI, YR, YI, TW, ROWS] = [0, 1, 2, 3, 4, 5, 6, 7];
  const j = f.iloc(),
    q = f.iloc(),
    sm8 = f.iloc(),
    inB = f.iloc(),
    outB = f.iloc(),
    t = f.iloc(),
    a = f.iloc(),
    o = f.iloc(),
    s8 = f.iloc();
  const L = (l: Local) => f.idx(l);
  // sm8 = s*m*8 ; s8 = s*8
  get(S);
  get(M);
  c.push(I32_MUL);
  iconst(3);
  c.push(I32_SHL);
  set(L(sm8));
  get(S);
  iconst(3);
  c.push(I32_SHL);
  set(L(s8));
  // v128 temps: SSA style
  type V = { k: 'v'; i: number };
  const bin = (op: number, x: V, y: V): V => {
    const r = f.vloc();
    get(L(x));
    get(L(y));
    c.push(...simd(op));
    set(L(r));
    return r;
  };
  const add = (x: V, y: V) => bin(F64X2_ADD, x, y),
    sub = (x: V, y: V) => bin(F64X2_SUB, x, y),
    mul = (x: V, y: V) => bin(F64X2_MUL, x, y);
  const neg = (x: V): V => {
    const r = f.vloc();
    get(L(x));
    c.push(...simd(F64X2_NEG));
    set(L(r));
    return r;
  };
  const memarg = (offset: number) => [3, ...uleb(offset)]; // align 2^3
  const load = (base: number, addr: Local, offset: number): V => {
    const r = f.vloc();
    get(base);
    get(L(addr));
    c.push(I32_ADD);
    c.push(...simd(V_LOAD), ...memarg(offset));
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
  // twiddles splat: tw + t*8 + k*8
  const hV = f.vloc();
  c.push(0x44, ...new Uint8Array(new Float64Array([Math.SQRT1_2]).buffer));
  c.push(...simd(F64X2_SPLAT));
  set(L(hV));
  // block { loop j }
  iconst(0);
  set(L(j));
  c.push(0x02, 0x40, 0x03, 0x40); // block, loop
  get(L(j));
  get(M);
  c.push(I32_LTU, I32_EQZ, 0x0d, 1); // br_if 1 (exit) when !(j<m)
  // t = tw + 14*j*8
  get(TW);
  get(L(j));
  iconst(112);
  c.push(I32_MUL, I32_ADD);
  set(L(t));
  const wv: V[] = [];
  for (let k = 0; k < 14; k++) {
    const r = f.vloc();
    get(L(t));
    c.push(...simd(V_LOAD64_SPLAT), ...memarg(8 * k));
    set(L(r));
    wv.push(r);
  }
  // inB = s*j*8, outB = 8*s*j*8
  get(L(s8));
  get(L(j));
  c.push(I32_MUL);
  set(L(inB));
  get(L(inB));
  iconst(3);
  c.push(I32_SHL);
  set(L(outB));
  iconst(0);
  set(L(q));
  c.push(0x02, 0x40, 0x03, 0x40);
  get(L(q));
  get(L(s8));
  c.push(I32_LTU, I32_EQZ, 0x0d, 1);
  // a = inB + q (bytes); loads at a + r*sm8
  get(L(inB));
  get(L(q));
  c.push(I32_ADD);
  set(L(a));
  const ar: V[] = [],
    ai: V[] = [];
  for (let r = 0; r < 8; r++) {
    // address a + r*sm8: compute into o temp
    if (r === 0) {
      ar.push(load(XR, a, 0));
      ai.push(load(XI, a, 0));
    } else {
      get(L(a));
      get(L(sm8));
      c.push(I32_ADD);
      set(L(a));
      ar.push(load(XR, a, 0));
      ai.push(load(XI, a, 0));
    }
  }
  const [a0r, a1r, a2r, a3r, a4r, a5r, a6r, a7r] = ar as [V, V, V, V, V, V, V, V];
  const [a0i, a1i, a2i, a3i, a4i, a5i, a6i, a7i] = ai as [V, V, V, V, V, V, V, V];
  const p0r = add(a0r, a4r),
    p0i = add(a0i, a4i),
    p1r = sub(a0r, a4r),
    p1i = sub(a0i, a4i);
  const p2r = add(a2r, a6r),
    p2i = add(a2i, a6i),
    p3r = sub(a2r, a6r),
    p3i = sub(a2i, a6i);
  const e0r = add(p0r, p2r),
    e0i = add(p0i, p2i),
    e2r = sub(p0r, p2r),
    e2i = sub(p0i, p2i);
  const e1r = add(p1r, p3i),
    e1i = sub(p1i, p3r),
    e3r = sub(p1r, p3i),
    e3i = add(p1i, p3r);
  const q0r = add(a1r, a5r),
    q0i = add(a1i, a5i),
    q1r = sub(a1r, a5r),
    q1i = sub(a1i, a5i);
  const q2r = add(a3r, a7r),
    q2i = add(a3i, a7i),
    q3r = sub(a3r, a7r),
    q3i = sub(a3i, a7i);
  const o0r = add(q0r, q2r),
    o0i = add(q0i, q2i),
    o2r = sub(q0r, q2r),
    o2i = sub(q0i, q2i);
  const o1r = add(q1r, q3i),
    o1i = sub(q1i, q3r),
    o3r = sub(q1r, q3i),
    o3i = add(q1i, q3r);
  const r1r = mul(hV, add(o1r, o1i)),
    r1i = mul(hV, sub(o1i, o1r));
  const r3r = mul(hV, sub(o3i, o3r)),
    r3i = mul(neg(hV), add(o3r, o3i));
  // outputs at outB + q + t*s8
  get(L(outB));
  get(L(q));
  c.push(I32_ADD);
  set(L(o));
  const out = (x: V, y: V) => {
    store(YR, o, x);
    store(YI, o, y);
    get(L(o));
    get(L(s8));
    c.push(I32_ADD);
    set(L(o));
  };
  const tw = (xr: V, xi: V, k: number) => {
    const wr = wv[2 * k - 2]!,
      wi = wv[2 * k - 1]!;
    out(sub(mul(xr, wr), mul(xi, wi)), add(mul(xr, wi), mul(xi, wr)));
  };
  out(add(e0r, o0r), add(e0i, o0i));
  tw(add(e1r, r1r), add(e1i, r1i), 1);
  tw(add(e2r, o2i), sub(e2i, o2r), 2);
  tw(add(e3r, r3r), add(e3i, r3i), 3);
  get(ROWS);
  iconst(4);
  c.push(0x4a /* i32.gt_s */, 0x04, 0x40); // if rows > 4
  tw(sub(e0r, o0r), sub(e0i, o0i), 4);
  tw(sub(e1r, r1r), sub(e1i, r1i), 5);
  tw(sub(e2r, o2i), add(e2i, o2r), 6);
  tw(sub(e3r, r3r), sub(e3i, r3i), 7);
  c.push(0x0b);
  get(L(q));
  iconst(16);
  c.push(I32_ADD);
  set(L(q)); // two lanes = 16 bytes
  c.push(0x0c, 0, 0x0b, 0x0b); // br loop; end loop; end block
  get(L(j));
  iconst(1);
  c.push(I32_ADD);
  set(L(j));
  c.push(0x0c, 0, 0x0b, 0x0b);
  c.push(0x0b); // end func
  const locals = [
    [...uleb(64), 0x7f],
    [...uleb(f.nV), 0x7b],
  ]; // 64 i32 (only nI used), nV v128
  const body = [...vec(locals), ...c];
  const bytes = [
    0x00,
    0x61,
    0x73,
    0x6d,
    1,
    0,
    0,
    0,
    ...section(1, vec([[0x60, ...vec(Array(P).fill([0x7f])), 0]])),
    ...section(2, vec([[...str('m'), ...str('mem'), 0x02, 0x00, ...uleb(64)]])),
    ...section(3, vec([[0]])),
    ...section(7, vec([[...str('radix8'), 0, 0]])),
    ...section(10, vec([[...uleb(body.length), ...body]])),
  ];
  return new Uint8Array(bytes);
}

/** The few WebAssembly globals used here (the project's TypeScript libraries do not declare them). */
interface WasmApi {
  Memory: new (descriptor: { initial: number }) => { buffer: ArrayBuffer };
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: Record<string, unknown> };
}
const wasm = (globalThis as unknown as { WebAssembly: WasmApi }).WebAssembly;

/** Runs the probe and returns printable lines and whether every compared output had the same bits. */
export function probeSimdRadix8(): { lines: string[]; identical: boolean } {
  const memory = new wasm.Memory({ initial: 64 });
  const instance = new wasm.Instance(new wasm.Module(buildRadix8()), { m: { mem: memory } });
  const wasmRadix8 = instance.exports.radix8 as (...args: number[]) => void;
  const cpu = (): number => {
    const c = process.cpuUsage();
    return (c.user + c.system) / 1e6;
  };
  const lines = ['fft SIMD probe: radix-8 stage, JavaScript vs WebAssembly f64x2 (lanes q, q + 1), CPU ns per point, best of 5'];
  let identical = true;
  for (const L of [1152, 1536, 2048]) {
    for (const st of makeStages(L, factorize(L))) {
      if (st.radix !== 8 || st.stride < 2) continue;
      const heap = new Float64Array(memory.buffer);
      const bytes = L * 8;
      const [XR, XI, YR, YI, TW] = [0, 1, 2, 3, 4].map((k) => k * bytes) as [number, number, number, number, number];
      const xr = heap.subarray(XR / 8, XR / 8 + L),
        xi = heap.subarray(XI / 8, XI / 8 + L);
      const yr = heap.subarray(YR / 8, YR / 8 + L),
        yi = heap.subarray(YI / 8, YI / 8 + L);
      heap.set(st.twiddles, TW / 8);
      for (let i = 0; i < L; i++) {
        xr[i] = Math.sin(i * 1.7) * 3;
        xi[i] = Math.cos(i * 0.3) - 0.2;
      }
      const jr = new Float64Array(L),
        ji = new Float64Array(L);
      let same = true;
      for (const rows of [8, 4]) {
        jr.fill(0);
        ji.fill(0);
        yr.fill(0);
        yi.fill(0);
        radix8(st.stride, st.span, xr, xi, jr, ji, st.twiddles, rows);
        wasmRadix8(st.stride, st.span, XR, XI, YR, YI, TW, rows);
        for (let i = 0; i < L; i++) if (!Object.is(jr[i], yr[i]) || !Object.is(ji[i], yi[i])) same = false;
      }
      identical &&= same;
      let js = Infinity,
        simd = Infinity;
      for (let round = 0; round < 5; round++) {
        const reps = 20000;
        let t0 = cpu();
        for (let r = 0; r < reps; r++) radix8(st.stride, st.span, xr, xi, jr, ji, st.twiddles, 8);
        js = Math.min(js, ((cpu() - t0) / reps / L) * 1e9);
        t0 = cpu();
        for (let r = 0; r < reps; r++) wasmRadix8(st.stride, st.span, XR, XI, YR, YI, TW, 8);
        simd = Math.min(simd, ((cpu() - t0) / reps / L) * 1e9);
      }
      lines.push(`  n = ${L}, stride ${st.stride}, span ${st.span}: JavaScript ${js.toFixed(2)}, f64x2 ${simd.toFixed(2)} (${(js / simd).toFixed(2)}×), bits ${same ? 'identical' : 'DIFFERENT'}`);
    }
  }
  return { lines, identical };
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { lines, identical } = probeSimdRadix8();
  for (const line of lines) console.log(line);
  if (!identical) process.exitCode = 1;
}
