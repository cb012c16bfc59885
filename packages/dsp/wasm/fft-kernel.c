// Double-precision FFT kernels for @turnstone/dsp, compiled to WebAssembly with 128-bit SIMD
// (one v128 holds one complex number, re in lane 0 and im in lane 1).
//
// Build: packages/dsp/wasm/build.sh (Debian's clang-14 and lld-14). The build writes
// packages/dsp/src/fft-kernel-wasm.ts; commit both files together.
//
// Algorithm: radix-8 Stockham autosort (Stockham 1966; Van Loan, "Computational Frameworks
// for the Fast Fourier Transform", SIAM 1992, §1.7), decimation in frequency, finished by
// one radix-4 or radix-2 pass when log2(n) is not a multiple of 3. Autosort: no bit-reversal pass, the result comes out
// in natural order from ping-ponging between two buffers. Real transforms pack the n reals
// as n/2 complex numbers and untangle the halves afterwards (Brigham 1988, ch. 9; Press et
// al., Numerical Recipes, §12.3).
//
// Memory is owned by the JavaScript side (no allocator here): every pointer is an offset
// into the module's linear memory that the caller reserved.

#include <wasm_simd128.h>

typedef v128_t cplx;

#define LOAD(p) wasm_v128_load(p)
#define STORE(p, v) wasm_v128_store((p), (v))
#define ADD(a, b) wasm_f64x2_add((a), (b))
#define SUB(a, b) wasm_f64x2_sub((a), (b))
#define MUL(a, b) wasm_f64x2_mul((a), (b))
#define SWAP(v) wasm_i64x2_shuffle((v), (v), 1, 0)

// v · w with w given as wre = (wr, wr), wim = (−wi, wi): (re·wr − im·wi, im·wr + re·wi).
// The inverse uses conj(w): v·wre − swap(v)·wim.
static inline __attribute__((always_inline)) cplx cmul(cplx v, cplx wre, cplx wim, int inv) {
  return inv ? SUB(MUL(v, wre), MUL(SWAP(v), wim)) : ADD(MUL(v, wre), MUL(SWAP(v), wim));
}

// One radix-4 pass of length-n sub-transforms at stride s (Stockham DIF):
// x[q + s(p + k·n/4)] → y[q + s(4p + k)], k = 0..3, twiddles w^p, w^2p, w^3p of this pass.
static inline __attribute__((always_inline)) void pass4(int n, int s, const double *x, double *y,
                                                        const double *tw, int inv) {
  const int n1 = n / 4;
  // multiplying by −i (forward) or +i (inverse): swap re/im, then negate one lane
  const cplx jmul = inv ? wasm_f64x2_make(-1.0, 1.0) : wasm_f64x2_make(1.0, -1.0);
  for (int p = 0; p < n1; p++) {
    const double *t = tw + 12 * p;
    const cplx w1r = LOAD(t), w1i = LOAD(t + 2);
    const cplx w2r = LOAD(t + 4), w2i = LOAD(t + 6);
    const cplx w3r = LOAD(t + 8), w3i = LOAD(t + 10);
    const double *xa = x + 2 * s * p;
    const double *xb = x + 2 * s * (p + n1);
    const double *xc = x + 2 * s * (p + 2 * n1);
    const double *xd = x + 2 * s * (p + 3 * n1);
    double *ya = y + 2 * s * (4 * p);
    for (int q = 0; q < s; q++) {
      const cplx a = LOAD(xa + 2 * q), b = LOAD(xb + 2 * q);
      const cplx c = LOAD(xc + 2 * q), d = LOAD(xd + 2 * q);
      const cplx apc = ADD(a, c), amc = SUB(a, c);
      const cplx bpd = ADD(b, d);
      const cplx jbmd = MUL(SWAP(SUB(b, d)), jmul);
      STORE(ya + 2 * q, ADD(apc, bpd));
      STORE(ya + 2 * (q + s), cmul(ADD(amc, jbmd), w1r, w1i, inv));
      STORE(ya + 2 * (q + 2 * s), cmul(SUB(apc, bpd), w2r, w2i, inv));
      STORE(ya + 2 * (q + 3 * s), cmul(SUB(amc, jbmd), w3r, w3i, inv));
    }
  }
}

// One radix-8 pass (Stockham DIF): x[q + s(p + r·n/8)], r = 0..7 → y[q + s(8p + k)], k = 0..7,
// the 8-point DFT split once more into two 4-point DFTs (even and odd k), then w^(pk).
// Twiddles: w^p … w^7p of this pass, 14 vectors per p.
static inline __attribute__((always_inline)) void pass8(int n, int s, const double *x, double *y,
                                                        const double *tw, int inv) {
  const int n1 = n / 8;
  const cplx jmul = inv ? wasm_f64x2_make(-1.0, 1.0) : wasm_f64x2_make(1.0, -1.0);
  const double r = 0.70710678118654752440;  // 1/√2
  // ω8 = e^(∓iπ/4) = (1 ∓ i)/√2 and ω8³ = (−1 ∓ i)/√2 as (re, re) and (−im, im) pairs
  const cplx w8r = wasm_f64x2_splat(r);
  const cplx w8i = inv ? wasm_f64x2_make(-r, r) : wasm_f64x2_make(r, -r);
  const cplx w83r = wasm_f64x2_splat(-r);
  for (int p = 0; p < n1; p++) {
    const double *t = tw + 28 * p;
    const double *xp = x + 2 * s * p;
    double *yp = y + 2 * s * (8 * p);
    const int st = 2 * s * n1;  // doubles between a_r and a_(r+1)
    for (int q = 0; q < s; q++) {
      const double *xq = xp + 2 * q;
      const cplx a0 = LOAD(xq), a1 = LOAD(xq + st), a2 = LOAD(xq + 2 * st), a3 = LOAD(xq + 3 * st);
      const cplx a4 = LOAD(xq + 4 * st), a5 = LOAD(xq + 5 * st), a6 = LOAD(xq + 6 * st),
                 a7 = LOAD(xq + 7 * st);
      // first radix-2 split: b_r = a_r + a_(r+4), c_r = (a_r − a_(r+4))·ω8^r
      const cplx b0 = ADD(a0, a4), b1 = ADD(a1, a5), b2 = ADD(a2, a6), b3 = ADD(a3, a7);
      const cplx c0 = SUB(a0, a4);
      const cplx c1 = cmul(SUB(a1, a5), w8r, w8i, 0);
      const cplx c2 = MUL(SWAP(SUB(a2, a6)), jmul);
      const cplx c3 = cmul(SUB(a3, a7), w83r, w8i, 0);
      // two 4-point DFTs: even outputs from b, odd outputs from c
      const cplx b02p = ADD(b0, b2), b02m = SUB(b0, b2);
      const cplx b13p = ADD(b1, b3), b13j = MUL(SWAP(SUB(b1, b3)), jmul);
      const cplx c02p = ADD(c0, c2), c02m = SUB(c0, c2);
      const cplx c13p = ADD(c1, c3), c13j = MUL(SWAP(SUB(c1, c3)), jmul);
      double *yq = yp + 2 * q;
      const int o = 2 * s;
      STORE(yq, ADD(b02p, b13p));
      STORE(yq + o, cmul(ADD(c02p, c13p), LOAD(t), LOAD(t + 2), inv));
      STORE(yq + 2 * o, cmul(ADD(b02m, b13j), LOAD(t + 4), LOAD(t + 6), inv));
      STORE(yq + 3 * o, cmul(ADD(c02m, c13j), LOAD(t + 8), LOAD(t + 10), inv));
      STORE(yq + 4 * o, cmul(SUB(b02p, b13p), LOAD(t + 12), LOAD(t + 14), inv));
      STORE(yq + 5 * o, cmul(SUB(c02p, c13p), LOAD(t + 16), LOAD(t + 18), inv));
      STORE(yq + 6 * o, cmul(SUB(b02m, b13j), LOAD(t + 20), LOAD(t + 22), inv));
      STORE(yq + 7 * o, cmul(SUB(c02m, c13j), LOAD(t + 24), LOAD(t + 26), inv));
    }
  }
}

// The last pass when log2(n) is odd: length-2 sub-transforms at stride s (no twiddles).
static void pass2(int s, const double *x, double *y) {
  for (int q = 0; q < s; q++) {
    const cplx a = LOAD(x + 2 * q), b = LOAD(x + 2 * (q + s));
    STORE(y + 2 * q, ADD(a, b));
    STORE(y + 2 * (q + s), SUB(a, b));
  }
}

static double *stockham(int n, double *x, double *y, const double *tw, int inv) {
  int len = n, s = 1;
  while (len >= 8) {
    if (inv)
      pass8(len, s, x, y, tw, 1);
    else
      pass8(len, s, x, y, tw, 0);
    tw += 28 * (len / 8);
    double *t = x;
    x = y;
    y = t;
    len /= 8;
    s *= 8;
  }
  if (len == 4) {
    if (inv)
      pass4(len, s, x, y, tw, 1);
    else
      pass4(len, s, x, y, tw, 0);
    double *t = x;
    x = y;
    y = t;
    len /= 4;
    s *= 4;
  }
  if (len == 2) {
    pass2(s, x, y);
    return y;
  }
  return x;
}

// Complex DFT of n points (a power of two ≥ 2), interleaved (re, im). x holds the input and is
// overwritten; y is work space of the same size. Returns the buffer (x or y) with the result.
// inv = 0: X_k = Σ x_j e^(−2πijk/n); inv = 1: the same with e^(+2πijk/n), unscaled.
// tw: the twiddle table written by the caller (see fft-kernel.ts, complexTwiddles).
double *fft_complex(int n, double *x, double *y, const double *tw, int inv) {
  return stockham(n, x, y, tw, inv);
}

// Untangles the half-length complex transform Z of a packed real sequence into bins 0 … n/2 of
// its real DFT (out: n + 2 doubles, interleaved). rt: (cos 2πk/n, −sin 2πk/n) for k = 0 … n/4.
static void untangle(int n, const double *z, const double *rt, double *out) {
  const int h = n / 2;
  const double z0r = z[0], z0i = z[1];
  out[0] = z0r + z0i;
  out[1] = 0;
  out[2 * h] = z0r - z0i;
  out[2 * h + 1] = 0;
  for (int k = 1; k <= h / 2; k++) {
    const int j = h - k;
    const double ar = z[2 * k], ai = z[2 * k + 1];
    const double br = z[2 * j], bi = z[2 * j + 1];
    const double er = 0.5 * (ar + br), ei = 0.5 * (ai - bi);
    const double or = 0.5 * (ai + bi), oi = -0.5 * (ar - br);
    const double wr = rt[2 * k], wi = rt[2 * k + 1];
    const double tr = wr * or - wi * oi, ti = wr * oi + wi * or;
    out[2 * k] = er + tr;
    out[2 * k + 1] = ei + ti;
    out[2 * j] = er - tr;
    out[2 * j + 1] = -ei + ti;
  }
}

// Real DFT of n reals (n a power of two ≥ 8): bins 0 … n/2 into out (n + 2 doubles). x (n
// doubles) is overwritten; y is n doubles of work space. tw: complex twiddles for n/2 points.
void fft_real(int n, double *x, double *y, const double *tw, const double *rt, double *out) {
  const double *z = stockham(n / 2, x, y, tw, 0);
  untangle(n, z, rt, out);
}

// Inverse of fft_real: the n reals whose one-sided spectrum is spec (bins 0 … n/2, interleaved;
// imaginary parts of DC and Nyquist ignored), times c·n (c = 1/n gives numpy's irfft). The
// halves are tangled into one n/2-point complex spectrum Z_k = E_k + i·W_k·D_k, with
// E_k = (X_k + conj X_{h−k})/2, D_k = (X_k − conj X_{h−k})/2, W_k = e^(+2πik/n), whose
// inverse holds the even samples in its real and the odd ones in its imaginary parts.
// x, y: n doubles each. Returns the buffer holding the n reals.
double *fft_real_inverse(int n, const double *spec, double *x, double *y, const double *tw,
                         const double *rt, double c) {
  const int h = n / 2;
  const double hc = c;  // ½ from E and D times 2 from inverting n points with an h-point transform
  const double a0 = spec[0], b0 = spec[2 * h];
  x[0] = hc * (a0 + b0);
  x[1] = hc * (a0 - b0);
  for (int k = 1; k <= h / 2; k++) {
    const int j = h - k;
    const double ar = spec[2 * k], ai = spec[2 * k + 1];
    const double br = spec[2 * j], bi = -spec[2 * j + 1];
    const double er = hc * (ar + br), ei = hc * (ai + bi);
    const double dr = hc * (ar - br), di = hc * (ai - bi);
    const double wr = rt[2 * k], wi = -rt[2 * k + 1];  // e^(+2πik/n)
    const double tr = dr * wr - di * wi, ti = dr * wi + di * wr;
    x[2 * k] = er - ti;
    x[2 * k + 1] = ei + tr;
    x[2 * j] = er + ti;
    x[2 * j + 1] = -ei + tr;
  }
  return stockham(h, x, y, tw, 1);
}

// |z| of the unscaled inverse complex DFT of m points (the analytic signal's magnitude, i.e.
// the envelope, when x holds a one-sided band spectrum). x holds the spectrum and is
// overwritten; y is work space (2·m doubles each); out gets m doubles.
void fft_inverse_magnitude(int m, double *x, double *y, const double *tw, double *out) {
  const double *z = stockham(m, x, y, tw, 1);
  for (int i = 0; i < m; i += 2) {
    const cplx a = LOAD(z + 2 * i), b = LOAD(z + 2 * i + 2);
    const cplx a2 = MUL(a, a), b2 = MUL(b, b);
    // (re², im²) of two numbers → (re_a² + im_a², re_b² + im_b²)
    const cplx sums = ADD(wasm_i64x2_shuffle(a2, b2, 0, 2), wasm_i64x2_shuffle(a2, b2, 1, 3));
    STORE(out + i, wasm_f64x2_sqrt(sums));
  }
}

// Welch's averaged periodogram, the sum part: for each of `segments` segments of `nperseg`
// samples starting `step` apart in data, remove the segment mean (when detrend is 1), apply
// the window, take the real DFT and add |X_k|² to power[k], k = 0 … nperseg/2. The caller
// scales (scipy.signal.welch conventions). frame, work: nperseg doubles each; spec: nperseg + 2.
void welch_sum(const double *data, int segments, int step, int nperseg, const double *win,
               int detrend, double *frame, double *work, const double *tw, const double *rt,
               double *spec, double *power) {
  const int bins = nperseg / 2 + 1;
  for (int s = 0; s < segments; s++) {
    const double *seg = data + (long)s * step;
    double mean = 0;
    if (detrend) {
      v128_t acc = wasm_f64x2_splat(0);
      for (int i = 0; i < nperseg; i += 2) acc = ADD(acc, LOAD(seg + i));
      mean = (wasm_f64x2_extract_lane(acc, 0) + wasm_f64x2_extract_lane(acc, 1)) / nperseg;
    }
    const cplx m = wasm_f64x2_splat(mean);
    for (int i = 0; i < nperseg; i += 2) STORE(frame + i, MUL(SUB(LOAD(seg + i), m), LOAD(win + i)));
    const double *z = stockham(nperseg / 2, frame, work, tw, 0);
    untangle(nperseg, z, rt, spec);
    for (int k = 0; k < bins; k++) {
      const double re = spec[2 * k], im = spec[2 * k + 1];
      power[k] += re * re + im * im;
    }
  }
}
