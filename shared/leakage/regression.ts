/**
 * Least-squares fit of a power law on logarithms, and the Student t distribution it needs.
 *
 * The t quantile is computed here rather than taken from a statistics package because this
 * module also runs in the browser and must stay dependency-free; the tests cross-check it
 * against jstat over df 1…60.
 */

/** Result of an ordinary least-squares fit y = intercept + slope·x (here x = ln ΔP, y = ln Q). */
export interface LogLogFit {
  /** Number of points N. */
  count: number
  /** Slope: the flow exponent n. */
  slope: number
  /** Intercept: ln C. */
  intercept: number
  /** Mean of x (x̄ = mean ln ΔP). */
  meanX: number
  /** Σ(x − x̄)² = (N−1)·S_x². */
  sxx: number
  /** Σ(y − ȳ)² = (N−1)·S_y². */
  syy: number
  /** Σ(x − x̄)(y − ȳ) = (N−1)·S_xy. */
  sxy: number
  /** Coefficient of determination r² (1 when every point lies on the line). */
  r2: number
  /** Standard error of the slope S_n; null for N = 2 (no degree of freedom left). */
  slopeStdError: number | null
  /** Standard error of the intercept S_lnC; null for N = 2. */
  interceptStdError: number | null
}

/**
 * Fits y = a + b·x by ordinary least squares over the first `count` entries of `x` and `y`.
 * Two passes (means first) keep the sums accurate; no array is allocated.
 *
 * Formulas: Roulet 2008, *Ventilation and Airflow in Buildings*, eqs. 7.13–7.16, as written in
 * CHECKS.md §2 (the ASTM E779 / ISO 9972 method; their notation from memory):
 * n = S_xy/S_x²; ln C = ȳ − n·x̄; r = S_xy/(S_x·S_y);
 * S_n = (1/S_x)·√((S_y² − n·S_xy)/(N−2)); S_lnC = S_n·√(Σx²/N).
 *
 * @throws RangeError when fewer than 2 points or all x are equal (validated input never is).
 */
export function fitLogLog(x: ArrayLike<number>, y: ArrayLike<number>, count: number): LogLogFit {
  if (count < 2) throw new RangeError('A least-squares fit needs at least 2 points')
  let sumX = 0
  let sumY = 0
  for (let i = 0; i < count; i++) {
    sumX += x[i] as number
    sumY += y[i] as number
  }
  const meanX = sumX / count
  const meanY = sumY / count
  let sxx = 0
  let syy = 0
  let sxy = 0
  for (let i = 0; i < count; i++) {
    const dx = (x[i] as number) - meanX
    const dy = (y[i] as number) - meanY
    sxx += dx * dx
    syy += dy * dy
    sxy += dx * dy
  }
  if (!(sxx > 0)) throw new RangeError('A least-squares fit needs at least 2 different pressures')
  const slope = sxy / sxx
  const intercept = meanY - slope * meanX
  // Residual sum of squares, algebraically (N−1)(S_y² − n·S_xy) of CHECKS.md §2, but summed from
  // the residuals: the difference form cancels badly when r² is close to 1.
  let sse = 0
  for (let i = 0; i < count; i++) {
    const e = (y[i] as number) - meanY - slope * ((x[i] as number) - meanX)
    sse += e * e
  }
  // r² = (S_xy/(S_x·S_y))² (CHECKS.md §2), written as the equal 1 − SSE/Σ(y−ȳ)² which keeps its
  // digits near 1; when every y is equal the line fits exactly.
  const r2 = syy > 0 ? 1 - sse / syy : 1
  let slopeStdError: number | null = null
  let interceptStdError: number | null = null
  if (count > 2) {
    // S_n = (1/S_x)·√((S_y² − n·S_xy)/(N−2)) — CHECKS.md §2; the (N−1) factors cancel.
    slopeStdError = Math.sqrt(sse / (count - 2) / sxx)
    // S_lnC = S_n·√(Σx²/N), with Σx²/N = Sxx/N + x̄² — CHECKS.md §2.
    interceptStdError = slopeStdError * Math.sqrt(sxx / count + meanX * meanX)
  }
  return { count, slope, intercept, meanX, sxx, syy, sxy, r2, slopeStdError, interceptStdError }
}

/**
 * Convenience wrapper: fits Q = C·ΔPⁿ to positive pressures and flows (takes the logarithms,
 * then {@link fitLogLog}). Roulet 2008 eqs. 7.13–7.16; CHECKS.md §2.
 */
export function fitPowerLaw(pressures: readonly number[], flows: readonly number[]): LogLogFit {
  const count = Math.min(pressures.length, flows.length)
  const x = new Float64Array(count)
  const y = new Float64Array(count)
  for (let i = 0; i < count; i++) {
    x[i] = Math.log(pressures[i] as number)
    y[i] = Math.log(flows[i] as number)
  }
  return fitLogLog(x, y, count)
}

// Lanczos approximation, g = 7, 9 terms (Lanczos 1964; this widely reproduced coefficient set
// gives ~15 significant digits — coefficients from memory, checked in the tests against Γ(5) = 24
// and Γ(½) = √π).
const LANCZOS_G = 7
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
] as const
const HALF_LN_2PI = 0.5 * Math.log(2 * Math.PI)

/** ln Γ(z) for z > 0 by the Lanczos approximation (g = 7, n = 9), with the reflection formula below ½. */
export function lnGamma(z: number): number {
  if (z < 0.5) {
    // Reflection: Γ(z)Γ(1−z) = π / sin(πz).
    return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * z))) - lnGamma(1 - z)
  }
  const zm1 = z - 1
  let a = LANCZOS[0]
  for (let i = 1; i < LANCZOS.length; i++) a += (LANCZOS[i] as number) / (zm1 + i)
  const t = zm1 + LANCZOS_G + 0.5
  return HALF_LN_2PI + (zm1 + 0.5) * Math.log(t) - t + Math.log(a)
}

// Continued fraction for the incomplete beta function, modified Lentz method
// (Numerical Recipes, 3rd ed., §6.4 "betacf").
function betaContinuedFraction(a: number, b: number, x: number): number {
  const TINY = 1e-300
  const EPS = 1e-15
  const qab = a + b
  const qap = a + 1
  const qam = a - 1
  let c = 1
  let d = 1 - (qab * x) / qap
  if (Math.abs(d) < TINY) d = TINY
  d = 1 / d
  let h = d
  for (let m = 1; m <= 500; m++) {
    const m2 = 2 * m
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2))
    d = 1 + aa * d
    if (Math.abs(d) < TINY) d = TINY
    c = 1 + aa / c
    if (Math.abs(c) < TINY) c = TINY
    d = 1 / d
    h *= d * c
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2))
    d = 1 + aa * d
    if (Math.abs(d) < TINY) d = TINY
    c = 1 + aa / c
    if (Math.abs(c) < TINY) c = TINY
    d = 1 / d
    const del = d * c
    h *= del
    if (Math.abs(del - 1) < EPS) break
  }
  return h
}

/**
 * Regularized incomplete beta function I_x(a, b), 0 ≤ x ≤ 1, a, b > 0
 * (Numerical Recipes, 3rd ed., §6.4: continued fraction, with the symmetry
 * I_x(a,b) = 1 − I_{1−x}(b,a) where the fraction converges slowly).
 */
export function regularizedIncompleteBeta(x: number, a: number, b: number): number {
  if (x <= 0) return 0
  if (x >= 1) return 1
  const lnFront =
    lnGamma(a + b) - lnGamma(a) - lnGamma(b) + a * Math.log(x) + b * Math.log1p(-x)
  if (x < (a + 1) / (a + b + 2)) return (Math.exp(lnFront) * betaContinuedFraction(a, b, x)) / a
  return 1 - (Math.exp(lnFront) * betaContinuedFraction(b, a, 1 - x)) / b
}

// Upper tail P(T > t) for t ≥ 0: ½·I_{ν/(ν+t²)}(ν/2, ½) (Abramowitz & Stegun 26.7.1 and 26.5.27
// — equation numbers from memory; the identity is the textbook one).
function studentTUpperTail(t: number, df: number): number {
  return 0.5 * regularizedIncompleteBeta(df / (df + t * t), df / 2, 0.5)
}

/**
 * Student t cumulative distribution P(T ≤ t) with `df` degrees of freedom, through the
 * regularized incomplete beta function (Abramowitz & Stegun 26.7.1 / 26.5.27 — numbers from memory).
 */
export function studentTCdf(t: number, df: number): number {
  if (t === 0) return 0.5
  const tail = studentTUpperTail(Math.abs(t), df)
  return t > 0 ? 1 - tail : tail
}

/** Student t density Γ((ν+1)/2)/(√(νπ)Γ(ν/2))·(1+t²/ν)^(−(ν+1)/2) (textbook definition; A&S 26.7.1 integrand). */
export function studentTPdf(t: number, df: number): number {
  const lnNorm = lnGamma((df + 1) / 2) - lnGamma(df / 2) - 0.5 * Math.log(df * Math.PI)
  return Math.exp(lnNorm - ((df + 1) / 2) * Math.log1p((t * t) / df))
}

// Standard normal upper-tail quantile for 0 < q ≤ ½, A&S 26.2.23 — from memory
// (|error| < 4.5e-4): only a starting point for Newton's method below.
function normalUpperQuantileApprox(q: number): number {
  const s = Math.sqrt(-2 * Math.log(q))
  return s - (2.515517 + 0.802853 * s + 0.010328 * s * s) / (1 + 1.432788 * s + 0.189269 * s * s + 0.001308 * s * s * s)
}

/**
 * Quantile of the Student t distribution: the t with P(T ≤ t) = p, for 0 < p < 1, df > 0.
 *
 * Closed forms for df = 1 (Cauchy: t = cot(πq)) and df = 2 (inverting the textbook CDF
 * F(t) = ½ + t/(2√(2+t²)): t = (1−2q)/√(2q(1−q))), q = upper-tail probability; otherwise a
 * Cornish–Fisher start (Abramowitz & Stegun 26.7.5 — equation number from memory) refined by
 * Newton's method on the exact tail (incomplete beta) inside a bisection bracket, to ~1e-14
 * relative. Cross-checked against jstat `studentt.inv` in the tests.
 */
export function studentTQuantile(p: number, df: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError('p must lie strictly between 0 and 1')
  if (!(df > 0)) throw new RangeError('degrees of freedom must be positive')
  if (p === 0.5) return 0
  // Work with the upper-tail probability q ≤ ½ for accuracy, then restore the sign.
  const q = p > 0.5 ? 1 - p : p
  const sign = p > 0.5 ? 1 : -1
  if (df === 1) return sign / Math.tan(Math.PI * q)
  if (df === 2) return (sign * (1 - 2 * q)) / Math.sqrt(2 * q * (1 - q))

  const z = normalUpperQuantileApprox(q)
  const z2 = z * z
  // Cornish–Fisher expansion, A&S 26.7.5.
  const g1 = (z2 * z + z) / 4
  const g2 = ((5 * z2 + 16) * z2 * z + 3 * z) / 96
  const g3 = (((3 * z2 + 19) * z2 + 17) * z2 * z - 15 * z) / 384
  const g4 = ((((79 * z2 + 776) * z2 + 1482) * z2 - 1920) * z2 * z - 945 * z) / 92160
  let t = z + g1 / df + g2 / (df * df) + g3 / (df * df * df) + g4 / (df * df * df * df)
  if (!(t > 0) || !Number.isFinite(t)) t = z

  // Bracket [lo, hi] with tail(lo) ≥ q ≥ tail(hi); the tail falls as t grows.
  let lo = 0
  let hi = t
  while (studentTUpperTail(hi, df) > q) {
    lo = hi
    hi *= 2
  }
  for (let i = 0; i < 100; i++) {
    const diff = studentTUpperTail(t, df) - q
    if (diff > 0) lo = t
    else hi = t
    // tail'(t) = −pdf(t), so the Newton step is +diff/pdf.
    let next = t + diff / studentTPdf(t, df)
    if (!(next > lo && next < hi)) next = (lo + hi) / 2
    if (Math.abs(next - t) <= 1e-15 * next) {
      t = next
      break
    }
    t = next
  }
  return sign * t
}

// t(0.975, df) memo by degrees of freedom: a test has at most 50 readings, so at most 48
// entries are ever filled and each is computed once per process.
const T975: number[] = []

/**
 * Two-sided 95 % Student t value, t(0.975, df), memoized by df (CHECKS.md §2 uses
 * t = Student t(0.975, N−2); e.g. t(0.975, 6) = 2.4469).
 */
export function studentT975(df: number): number {
  const hit = T975[df]
  if (hit !== undefined) return hit
  const t = studentTQuantile(0.975, df)
  if (Number.isInteger(df) && df > 0 && df <= 1000) T975[df] = t
  return t
}
