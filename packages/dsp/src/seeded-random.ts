/**
 * Seeded pseudo-random numbers, one home for every generator of the project: the simulator
 * (a capture is the same bytes every time it is generated, so a retry or a second run sends
 * identical content under the same uid), test captures and the benchmarks' fault libraries
 * (a failure repeats with its seed).
 */

/** Mulberry32 (Tommy Ettinger's public-domain generator): uniform in [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * The 32-bit linear congruential generator of Numerical Recipes (Press et al., 2nd ed., §7.1:
 * a = 1664525, c = 1013904223, m = 2³²): each state over 2³², uniform in [0, 1). The tests'
 * noise and the diagnosis benchmark's cases come from it.
 */
export function lcg32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** 32-bit FNV-1a hash of a string: turns a capture's uid into its seed. */
export function fnv1a(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Standard normal deviates by the Box–Muller transform over a uniform source. */
export function gaussian(uniform: () => number): () => number {
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    const u = Math.max(uniform(), 1e-12);
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}
