/**
 * Energies of impulse responses without integrating over frequency (Parseval), from Gramians: for a
 * realisation x' = A·x + b·u, y = c·x (or x[n+1] = A·x[n] + b·u[n]) the energy ∫₀^∞ h(t)² dt (or
 * Σ h[n]²) is c·P·cᵀ, where the controllability Gramian P solves the Lyapunov equation
 * A·P + P·Aᵀ + b·bᵀ = 0 (or P = A·P·Aᵀ + b·bᵀ) (As70, ZDG96). The symmetric unknowns P_ij (i ≤ j) are
 * solved as one small linear system (n(n + 1)/2 unknowns) by Gaussian elimination with partial pivoting,
 * then one step of iterative refinement on the residual of the matrix equation: without it a loop whose
 * poles crowd z = 1 keeps only nine or ten digits, with it about twelve (checked against SciPy and
 * against the impulse response summed sample by sample, test/analysis/noiseBandwidthExact.test.ts).
 */

/** Index of P_ij (i ≤ j, or its mirror) among the n(n + 1)/2 unknowns of a symmetric n×n matrix. */
function symmetricIndex(i: number, j: number, n: number): number {
  return i <= j ? i * n - (i * (i - 1)) / 2 + (j - i) : j * n - (j * (j - 1)) / 2 + (i - j);
}

/** A linear map of symmetric n×n matrices (row-major), written into `out`. */
type SymmetricMap = (p: Float64Array, out: Float64Array) => void;

/**
 * The image of the unit symmetric matrix E_kl (1 at (k, l) and (l, k)) under a map, written into `image`
 * at every i ≤ j (the entries the system reads), equal there to map(E_kl, image)'s doubles.
 */
type UnitImage = (k: number, l: number, image: Float64Array) => void;

/**
 * The symmetric P with map(P) = rhs: the system's columns are the map of each unit symmetric matrix
 * (so it cannot disagree with the map; unitImage, when given, computes those same doubles directly),
 * solved, then refined once with rhs − map(P). Null when singular.
 */
function solveSymmetric(map: SymmetricMap, rhs: Float64Array, n: number, unitImage: UnitImage | null): Float64Array | null {
  const m = (n * (n + 1)) / 2;
  const system = new Float64Array(m * m);
  const unit = new Float64Array(n * n);
  const image = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    for (let l = k; l < n; l++) {
      if (unitImage) unitImage(k, l, image);
      else {
        unit.fill(0);
        unit[k * n + l] = 1;
        unit[l * n + k] = 1;
        map(unit, image);
      }
      const col = symmetricIndex(k, l, n);
      for (let i = 0; i < n; i++) for (let j = i; j < n; j++) system[symmetricIndex(i, j, n) * m + col] = image[i * n + j]!;
    }
  }
  const pivots = factorize(system, m);
  if (!pivots) return null;
  const x = toUnknowns(rhs, n);
  solveFactorized(system, pivots, x);
  const p = fromUnknowns(x, n);
  map(p, image);
  for (let i = 0; i < n * n; i++) image[i] = rhs[i]! - image[i]!;
  const delta = toUnknowns(image, n);
  solveFactorized(system, pivots, delta);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) p[i * n + j] = p[i * n + j]! + delta[symmetricIndex(i, j, n)]!;
  return p;
}

function toUnknowns(s: Float64Array, n: number): Float64Array {
  const x = new Float64Array((n * (n + 1)) / 2);
  for (let i = 0; i < n; i++) for (let j = i; j < n; j++) x[symmetricIndex(i, j, n)] = s[i * n + j]!;
  return x;
}

function fromUnknowns(x: Float64Array, n: number): Float64Array {
  const p = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) p[i * n + j] = x[symmetricIndex(i, j, n)]!;
  return p;
}

/**
 * Gaussian elimination with partial pivoting of the m×m row-major matrix, in place: its upper triangle
 * becomes U, and below the diagonal each row keeps the multiplier it was reduced by at that column
 * (where the elimination leaves only a rounding residue nothing reads). Returns the pivot row of each
 * column, or null when singular. The solve and its refinement share one elimination: solveFactorized
 * repeats on a right-hand side exactly the operations an elimination of [M | r] did to r.
 */
function factorize(lu: Float64Array, m: number): Int32Array | null {
  const pivots = new Int32Array(m);
  for (let col = 0; col < m; col++) {
    let piv = col;
    for (let row = col + 1; row < m; row++) if (Math.abs(lu[row * m + col]!) > Math.abs(lu[piv * m + col]!)) piv = row;
    if (!(Math.abs(lu[piv * m + col]!) > 1e-300)) return null;
    pivots[col] = piv;
    if (piv !== col) {
      for (let j = col; j < m; j++) {
        const t = lu[col * m + j]!;
        lu[col * m + j] = lu[piv * m + j]!;
        lu[piv * m + j] = t;
      }
    }
    const pv = lu[col * m + col]!;
    for (let row = col + 1; row < m; row++) {
      const f = lu[row * m + col]! / pv;
      if (f !== 0) for (let j = col + 1; j < m; j++) lu[row * m + j] = lu[row * m + j]! - f * lu[col * m + j]!;
      lu[row * m + col] = f;
    }
  }
  return pivots;
}

/** x ← M⁻¹·x from factorize's lu and pivots: the row swaps and reductions in their order, then back substitution. */
function solveFactorized(lu: Float64Array, pivots: Int32Array, x: Float64Array): void {
  const m = x.length;
  for (let col = 0; col < m; col++) {
    const piv = pivots[col]!;
    if (piv !== col) {
      const t = x[col]!;
      x[col] = x[piv]!;
      x[piv] = t;
    }
    for (let row = col + 1; row < m; row++) {
      const f = lu[row * m + col]!;
      if (f !== 0) x[row] = x[row]! - f * x[col]!;
    }
  }
  for (let row = m - 1; row >= 0; row--) {
    let acc = x[row]!;
    for (let j = row + 1; j < m; j++) acc -= lu[row * m + j]! * x[j]!;
    x[row] = acc / lu[row * m + row]!;
  }
}

/** out = A·p·Aᵀ (row-major n×n; t is n×n scratch). */
function congruence(a: Float64Array, p: Float64Array, n: number, t: Float64Array, out: Float64Array): void {
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += a[i * n + k]! * p[k * n + j]!;
      t[i * n + j] = acc;
    }
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += t[i * n + k]! * a[j * n + k]!;
      out[i * n + j] = acc;
    }
  }
}

/** c·P·cᵀ when finite and non-negative, else null. */
function quadratic(p: Float64Array | null, c: Float64Array, n: number): number | null {
  if (!p) return null;
  let energy = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) energy += c[i]! * p[i * n + j]! * c[j]!;
  return energy >= 0 && Number.isFinite(energy) ? energy : null;
}

/**
 * Σ_{k ≥ 0} (c·Aᵏ·b)² of x[k+1] = A·x[k] + b·u[k], y = c·x (A row-major n×n): c·P·cᵀ with
 * P − A·P·Aᵀ = b·bᵀ. A must be stable (the caller tests it); null when the system is singular or the
 * sum comes out not finite or negative.
 */
export function discreteEnergy(a: Float64Array, b: Float64Array, c: Float64Array, n: number): number | null {
  const t = new Float64Array(n * n);
  const rhs = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) rhs[i * n + j] = b[i]! * b[j]!;
  // The map passed as it is made (here and below): under tsx, which keeps names, a closure bound to a
  // name has that name defined when it is made (Object.defineProperty, about 0.4 µs a call).
  const p = solveSymmetric(
    (x, out) => discreteMap(a, n, x, out, t),
    rhs,
    n,
    a.every(Number.isFinite) ? (k, l, image) => discreteUnitImage(a, n, k, l, image) : null,
  );
  return quadratic(p, c, n);
}

/** out = x − A·x·Aᵀ, discreteEnergy's map (t is n×n scratch). */
export function discreteMap(a: Float64Array, n: number, x: Float64Array, out: Float64Array, t: Float64Array): void {
  congruence(a, x, n, t, out);
  for (let i = 0; i < n * n; i++) out[i] = x[i]! - out[i]!;
}

/** 1 at (k, l) and (l, k) of E_kl, else 0. */
function unitEntry(k: number, l: number, i: number, j: number): number {
  return (i === k && j === l) || (i === l && j === k) ? 1 : 0;
}

/**
 * E_kl − A·E_kl·Aᵀ at i ≤ j, as discreteEnergy's map computes it, for a finite A. In congruence's first
 * product T = A·E_kl only the terms A_ik·1 (column l) and A_il·1 (column k) are not ±0, so T_il = 0 + A_ik,
 * T_ik = 0 + A_il and every other T is +0; its second, (T·Aᵀ)_ij, adds T_ik·A_jk and then T_il·A_jl (k < l)
 * to +0. Every term left out is a finite number times +0 or 0, a ±0, and a sum that starts at +0 is never
 * −0 (x + (−x) rounds to +0), so adding ±0 leaves it as it is: the same doubles as the full products,
 * from about a tenth of their operations.
 */
export function discreteUnitImage(a: Float64Array, n: number, k: number, l: number, image: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const tk = 0 + a[i * n + (k === l ? k : l)]!;
    const tl = 0 + a[i * n + k]!;
    for (let j = i; j < n; j++) {
      const first = 0 + tk * a[j * n + k]!;
      const out = k === l ? first : first + tl * a[j * n + l]!;
      image[i * n + j] = unitEntry(k, l, i, j) - out;
    }
  }
}

/**
 * ∫₀^∞ h(t)² dt of a strictly proper analog num/den (coefficients highest power first), from the
 * controllable canonical form after the frequency scaling s = w0·σ that puts the geometric mean of the
 * pole magnitudes at 1 (so the companion coefficients are of order one; unscaled, an IF loop's Gramian
 * loses every digit); the energy of H is w0 times that of the scaled H. H must be stable (the caller
 * tests it); null when not strictly proper, singular, or the energy comes out not finite or negative.
 */
export function continuousEnergy(num: readonly number[], den: readonly number[]): number | null {
  let first = 0;
  while (first < den.length && den[first] === 0) first++;
  const d = den.slice(first);
  const n = d.length - 1;
  if (n < 1 || num.length > n) return null;
  const lead = d[0]!;
  const ratio = Math.abs(d[n]! / lead);
  const w0 = ratio > 0 && Number.isFinite(ratio) ? ratio ** (1 / n) : 1;
  // x_i' = x_{i+1}, x_n' = −Σ c_k·x_{n+1−k} + u for the scaled monic σⁿ + c1·σⁿ⁻¹ + … + cn; y = Σ cNum[p]·x_{p+1}.
  const a = new Float64Array(n * n);
  for (let i = 0; i + 1 < n; i++) a[i * n + i + 1] = 1;
  for (let j = 0; j < n; j++) a[(n - 1) * n + j] = -d[n - j]! / (lead * w0 ** (n - j));
  const cNum = new Float64Array(n);
  for (let j = 0; j < num.length; j++) {
    const power = num.length - 1 - j;
    cNum[power] = num[j]! / (lead * w0 ** (n - power));
  }
  const rhs = new Float64Array(n * n);
  rhs[n * n - 1] = -1; // −b·bᵀ with b = e_n
  const p = solveSymmetric(
    (x, out) => continuousMap(a, n, x, out),
    rhs,
    n,
    a.every(Number.isFinite) ? (k, l, image) => continuousUnitImage(a, n, k, l, image) : null,
  );
  const energy = quadratic(p, cNum, n);
  return energy === null ? null : w0 * energy;
}

/** out = A·x + x·Aᵀ, continuousEnergy's map, each element one sum over k of A_ik·x_kj + x_ik·A_jk. */
export function continuousMap(a: Float64Array, n: number, x: Float64Array, out: Float64Array): void {
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let acc = 0;
      for (let k = 0; k < n; k++) acc += a[i * n + k]! * x[k * n + j]! + x[i * n + k]! * a[j * n + k]!;
      out[i * n + j] = acc;
    }
  }
}

/**
 * A·E_kl + E_kl·Aᵀ at i ≤ j, as continuousMap computes it, for a finite A: of its sum over m only the
 * terms at m = k and m = l hold an entry of E_kl that is not 0; every other term is a finite number
 * times 0 twice, a ±0, which leaves a sum that starts at +0 as it is (see discreteUnitImage). The same
 * doubles from the two terms that matter, taken in the sum's order.
 */
export function continuousUnitImage(a: Float64Array, n: number, k: number, l: number, image: Float64Array): void {
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let acc = 0 + (a[i * n + k]! * unitEntry(k, l, k, j) + unitEntry(k, l, i, k) * a[j * n + k]!);
      if (l !== k) acc = acc + (a[i * n + l]! * unitEntry(k, l, l, j) + unitEntry(k, l, i, l) * a[j * n + l]!);
      image[i * n + j] = acc;
    }
  }
}
