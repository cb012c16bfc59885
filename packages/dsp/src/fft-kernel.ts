import { FFT_KERNEL_WASM_BASE64 } from './fft-kernel-wasm.ts';

// The WebAssembly FFT kernels (wasm/fft-kernel.c) and the memory they work in. Internal to
// the package: fft-plan.ts and welch.ts use it when the runtime has WebAssembly with SIMD and
// fall back to fft.js otherwise. Buffers live in the module's linear memory; the
// JavaScript side reserves them once per transform size and copies data in and out.

// The few WebAssembly JS API members used here (the package compiles without the DOM lib).
interface WasmMemory {
  readonly buffer: ArrayBuffer;
  grow(pages: number): number;
}
interface WasmRuntime {
  Module: new (bytes: Uint8Array) => object;
  Instance: new (module: object, imports: object) => { exports: object };
}

interface KernelExports {
  memory: WasmMemory;
  __heap_base: { value: unknown };
  fft_complex(n: number, x: number, y: number, tw: number, inv: number): number;
  fft_real(n: number, x: number, y: number, tw: number, rt: number, out: number): void;
  fft_real_inverse(
    n: number,
    spec: number,
    x: number,
    y: number,
    tw: number,
    rt: number,
    c: number,
  ): number;
  fft_inverse_magnitude(m: number, x: number, y: number, tw: number, out: number): void;
  welch_sum(
    data: number,
    segments: number,
    step: number,
    nperseg: number,
    win: number,
    detrend: number,
    frame: number,
    work: number,
    tw: number,
    rt: number,
    spec: number,
    power: number,
  ): void;
}

/** A complex transform of one power-of-two size running in the WebAssembly kernel. */
export interface KernelComplexPlan {
  /** Forward DFT of `input` (2·n interleaved doubles) into `out`. */
  forward(out: Float64Array, input: Float64Array): void;
  /** Inverse DFT without the 1/n factor. */
  inverseUnscaled(out: Float64Array, input: Float64Array): void;
  /** |z| of the unscaled inverse DFT of `input` into `out` (n doubles). */
  inverseMagnitude(out: Float64Array, input: Float64Array): void;
}

/** A real transform of one power-of-two size (≥ 8) running in the WebAssembly kernel. */
export interface KernelRealPlan {
  /** Bins 0 … n/2 of the DFT of `input` (n reals) into `out` (≥ n + 2 doubles). */
  realForward(out: Float64Array, input: Float64Array): void;
  /**
   * The n reals whose one-sided spectrum (bins 0 … n/2, interleaved) is `spectrum`, with the
   * 1/n factor (numpy's irfft); imaginary parts of DC and Nyquist ignored.
   */
  realInverse(out: Float64Array, spectrum: Float64Array): void;
}

export interface FftKernel {
  complexPlan(n: number): KernelComplexPlan;
  realPlan(n: number): KernelRealPlan;
  /**
   * Σ over Welch segments of |DFT{(x − mean)·w}|², bins 0 … nperseg/2, into `power` (which
   * it overwrites). nperseg is a power of two ≥ 8.
   */
  welchSum(
    data: Float64Array,
    segments: number,
    step: number,
    window: Float64Array,
    detrend: boolean,
    power: Float64Array,
  ): void;
}

const BYTES = Float64Array.BYTES_PER_ELEMENT;

/**
 * Twiddles of the Stockham passes for an n-point complex DFT, in the order the kernel runs
 * them: radix-8 passes of length L = n, n/8, … while L ≥ 8, then one radix-4 pass when L = 4.
 * For each pass and p < L/radix, the powers w^p … w^((radix−1)p) of w = e^(−2πi/L), each as
 * (re, re, −im, im) — the layout the kernel's complex multiply reads. Each angle is computed
 * directly (no recurrences), so rounding stays at one ulp.
 */
function complexTwiddles(n: number): Float64Array {
  const passes: [length: number, radix: number][] = [];
  let len = n;
  for (; len >= 8; len /= 8) passes.push([len, 8]);
  if (len === 4) passes.push([4, 4]);
  const count = passes.reduce((a, [l, r]) => a + (l / r) * (r - 1), 0);
  const tw = new Float64Array(4 * count);
  let o = 0;
  for (const [l, radix] of passes) {
    for (let p = 0; p < l / radix; p++) {
      for (let m = 1; m < radix; m++) {
        const angle = (2 * Math.PI * ((m * p) % l)) / l;
        const re = Math.cos(angle);
        const im = -Math.sin(angle);
        tw[o++] = re;
        tw[o++] = re;
        tw[o++] = -im;
        tw[o++] = im;
      }
    }
  }
  return tw;
}

/** (cos 2πk/n, −sin 2πk/n) for k = 0 … n/4: the real-transform untangling twiddles. */
function realTwiddles(n: number): Float64Array {
  const rt = new Float64Array(2 * (n / 4 + 1));
  for (let k = 0; k <= n / 4; k++) {
    rt[2 * k] = Math.cos((2 * Math.PI * k) / n);
    rt[2 * k + 1] = -Math.sin((2 * Math.PI * k) / n);
  }
  return rt;
}

function decodeBase64(text: string): Uint8Array {
  if (typeof atob === 'function') {
    const raw = atob(text);
    const bytes = new Uint8Array(raw.length);
    for (let i = 0; i < raw.length; i++) bytes[i] = raw.charCodeAt(i);
    return bytes;
  }
  throw new Error('no base64 decoder');
}

function instantiate(wasm: WasmRuntime): FftKernel {
  const module = new wasm.Module(decodeBase64(FFT_KERNEL_WASM_BASE64));
  const exports = new wasm.Instance(module, {}).exports as KernelExports;
  const memory = exports.memory;
  let top = Number(exports.__heap_base.value);
  let view = new Float64Array(memory.buffer);

  /** Reserves `doubles` doubles (16-byte aligned) and returns their byte offset. */
  const reserve = (doubles: number): number => {
    top = Math.ceil(top / 16) * 16;
    const at = top;
    top += doubles * BYTES;
    const need = top - memory.buffer.byteLength;
    if (need > 0) memory.grow(Math.ceil(need / 65536));
    if (view.buffer !== memory.buffer) view = new Float64Array(memory.buffer);
    return at;
  };
  const store = (doubles: Float64Array): number => {
    const at = reserve(doubles.length);
    view.set(doubles, at / BYTES);
    return at;
  };

  const twiddles = new Map<number, number>();
  const complexTw = (n: number): number => {
    let at = twiddles.get(n);
    if (at === undefined) {
      at = store(complexTwiddles(n));
      twiddles.set(n, at);
    }
    return at;
  };
  const untangling = new Map<number, number>();
  const realTw = (n: number): number => {
    let at = untangling.get(n);
    if (at === undefined) {
      at = store(realTwiddles(n));
      untangling.set(n, at);
    }
    return at;
  };

  // Work buffers per size: x, y of 2·n doubles (complex) or n doubles (real), and out.
  const complexPlans = new Map<number, KernelComplexPlan>();
  const realPlans = new Map<number, KernelRealPlan>();
  // Welch's input copy grows to the largest record seen.
  let dataAt = 0;
  let dataCapacity = 0;
  const welchBuffers = new Map<
    number,
    { frame: number; work: number; spec: number; power: number }
  >();

  return {
    complexPlan(n) {
      let plan = complexPlans.get(n);
      if (!plan) {
        const tw = complexTw(n);
        const x = reserve(2 * n);
        const y = reserve(2 * n);
        const load = (input: Float64Array): void =>
          view.set(input.length === 2 * n ? input : input.subarray(0, 2 * n), x / BYTES);
        const run = (out: Float64Array, input: Float64Array, inv: number): void => {
          load(input);
          const at = exports.fft_complex(n, x, y, tw, inv);
          out.set(view.subarray(at / BYTES, at / BYTES + 2 * n));
        };
        let magnitude = 0;
        plan = {
          forward: (out, input) => run(out, input, 0),
          inverseUnscaled: (out, input) => run(out, input, 1),
          inverseMagnitude(out, input) {
            if (magnitude === 0) magnitude = reserve(n);
            load(input);
            exports.fft_inverse_magnitude(n, x, y, tw, magnitude);
            out.set(view.subarray(magnitude / BYTES, magnitude / BYTES + n));
          },
        };
        complexPlans.set(n, plan);
      }
      return plan;
    },
    realPlan(n) {
      let plan = realPlans.get(n);
      if (!plan) {
        const tw = complexTw(n / 2);
        const rt = realTw(n);
        const x = reserve(n);
        const y = reserve(n);
        const out = reserve(n + 2);
        plan = {
          realForward(result, input) {
            view.set(input.length === n ? input : input.subarray(0, n), x / BYTES);
            exports.fft_real(n, x, y, tw, rt, out);
            result.set(view.subarray(out / BYTES, out / BYTES + n + 2));
          },
          realInverse(result, spectrum) {
            view.set(spectrum.subarray(0, n + 2), out / BYTES);
            const at = exports.fft_real_inverse(n, out, x, y, tw, rt, 1 / n);
            result.set(view.subarray(at / BYTES, at / BYTES + n));
          },
        };
        realPlans.set(n, plan);
      }
      return plan;
    },
    welchSum(data, segments, step, window, detrend, power) {
      const nperseg = window.length;
      let b = welchBuffers.get(nperseg);
      if (!b) {
        b = {
          frame: reserve(nperseg),
          work: reserve(nperseg),
          spec: reserve(nperseg + 2),
          power: reserve(nperseg / 2 + 1),
        };
        welchBuffers.set(nperseg, b);
      }
      const tw = complexTw(nperseg / 2);
      const rt = realTw(nperseg);
      const win = windowAt(window);
      if (data.length > dataCapacity) {
        dataCapacity = data.length;
        dataAt = reserve(dataCapacity);
      }
      view.set(data, dataAt / BYTES);
      const bins = nperseg / 2 + 1;
      view.fill(0, b.power / BYTES, b.power / BYTES + bins);
      exports.welch_sum(
        dataAt,
        segments,
        step,
        nperseg,
        win,
        detrend ? 1 : 0,
        b.frame,
        b.work,
        tw,
        rt,
        b.spec,
        b.power,
      );
      power.set(view.subarray(b.power / BYTES, b.power / BYTES + bins));
    },
  };

  // Windows are cached by the caller (window-functions.ts), so the same array object comes
  // back for the same window; it is copied into the kernel's memory once.
  function windowAt(window: Float64Array): number {
    let at = windows.get(window);
    if (at === undefined) {
      at = store(window);
      windows.set(window, at);
    }
    return at;
  }
}
const windows = new WeakMap<Float64Array, number>();

let kernel: FftKernel | null | undefined;

/**
 * The WebAssembly kernel, instantiated on first use; null where the runtime has no
 * WebAssembly SIMD (then the callers use fft.js). Set TURNSTONE_FFT=js to force the fallback.
 */
export function fftKernel(): FftKernel | null {
  if (kernel === undefined) {
    kernel = null;
    const forced =
      typeof process !== 'undefined' && process.env ? process.env.TURNSTONE_FFT : undefined;
    const wasm = (globalThis as { WebAssembly?: WasmRuntime }).WebAssembly;
    if (forced !== 'js' && wasm) {
      try {
        kernel = instantiate(wasm);
      } catch {
        kernel = null;
      }
    }
  }
  return kernel;
}
