/**
 * The standard normal distribution: density, distribution function and quantile.
 *
 * The distribution function uses Cody's rational Chebyshev approximations of the error
 * function on three ranges (|x| ≤ 0.67, ≤ √32, beyond), which keep full relative accuracy in
 * both tails down to the smallest normal double; the quantile is Wichura's AS 241 (PPND16),
 * accurate to about 1 part in 10^16.
 *
 * bench/parallel/polychoric-worker.ts (a benchmark's kernel; the audit starts no such thread)
 * runs `normalCdf` in a worker thread from its source text.
 *
 * References: Cody 1969, "Rational Chebyshev approximations for the error function"
 * (Mathematics of Computation 23:631-637); Cody 1993, "Algorithm 715: SPECFUN, a portable
 * FORTRAN package of special function routines and test drivers" (ACM TOMS 19:22-32);
 * Wichura 1988, "Algorithm AS 241: The percentage points of the normal distribution"
 * (Applied Statistics 37:477-484).
 */

/**
 * Density of the standard normal distribution, `exp(−x²/2) / √(2π)`.
 * @param x Any real number (±Infinity give 0).
 * @throws {RangeError} when x is NaN.
 * @returns The density at x.
 * References: Gauss 1809, "Theoria motus corporum coelestium" (the normal law).
 */
export function normalDensity(x: number): number {
  if (Number.isNaN(x)) throw new RangeError('normalDensity: x is NaN');
  return Math.exp(-0.5 * x * x) * 0.3989422804014327;
}

/**
 * Standard normal distribution function Φ(x) = P(Z ≤ x), accurate to full relative precision
 * in both tails (use `normalCdf(-x)` for the upper tail P(Z > x): it is computed directly,
 * never as 1 − Φ(x)).
 * @param x Any real number; −Infinity gives 0 and +Infinity gives 1.
 * @throws {RangeError} when x is NaN.
 * @returns Φ(x) in [0, 1].
 * References: Cody 1969, "Rational Chebyshev approximations for the error function";
 * Cody 1993, "Algorithm 715: SPECFUN" (the ANORM routine).
 */
export function normalCdf(x: number): number {
  if (Number.isNaN(x)) throw new RangeError('normalCdf: x is NaN');
  const y = Math.abs(x);
  if (y <= 0.66291) {
    // Φ(x) = 1/2 + x·R(x²) near the centre.
    const xsq = y > 1.1102230246251565e-16 ? x * x : 0;
    let numerator = 0.065682337918207449113 * xsq;
    let denominator = xsq;
    numerator = (numerator + 2.2352520354606839287) * xsq;
    denominator = (denominator + 47.20258190468824187) * xsq;
    numerator = (numerator + 161.02823106855587881) * xsq;
    denominator = (denominator + 976.09855173777669322) * xsq;
    numerator = (numerator + 1067.6894854603709582) * xsq;
    denominator = (denominator + 10260.932208618978205) * xsq;
    return 0.5 + (x * (numerator + 18154.981253343561249)) / (denominator + 45507.789335026729956);
  }
  let tail: number;
  if (y <= 5.656854249492381) {
    // 0.66291 < |x| <= √32: the tail is exp(−x²/2)·R(|x|).
    let numerator = 1.0765576773720192317e-8 * y;
    let denominator = y;
    numerator = (numerator + 0.39894151208813466764) * y;
    denominator = (denominator + 22.266688044328115691) * y;
    numerator = (numerator + 8.8831497943883759412) * y;
    denominator = (denominator + 235.38790178262499861) * y;
    numerator = (numerator + 93.506656132177855979) * y;
    denominator = (denominator + 1519.377599407554805) * y;
    numerator = (numerator + 597.27027639480026226) * y;
    denominator = (denominator + 6485.558298266760755) * y;
    numerator = (numerator + 2494.5375852903726711) * y;
    denominator = (denominator + 18615.571640885098091) * y;
    numerator = (numerator + 6848.1904505362823326) * y;
    denominator = (denominator + 34900.952721145977266) * y;
    numerator = (numerator + 11602.651437647350124) * y;
    denominator = (denominator + 38912.003286093271411) * y;
    tail = (numerator + 9842.7148383839780218) / (denominator + 19685.429676859990727);
  } else if (y < 40) {
    // |x| > √32: asymptotic form (1/√(2π) − R(1/x²)/x²) / |x| times exp(−x²/2).
    const xsq = 1 / (x * x);
    let numerator = 0.02307344176494017303 * xsq;
    let denominator = xsq;
    numerator = (numerator + 0.21589853405795699) * xsq;
    denominator = (denominator + 1.28426009614491121) * xsq;
    numerator = (numerator + 0.1274011611602473639) * xsq;
    denominator = (denominator + 0.468238212480865118) * xsq;
    numerator = (numerator + 0.022235277870649807) * xsq;
    denominator = (denominator + 0.0659881378689285515) * xsq;
    numerator = (numerator + 0.001421619193227893466) * xsq;
    denominator = (denominator + 0.00378239633202758244) * xsq;
    tail = (xsq * (numerator + 2.9112874951168792e-5)) / (denominator + 7.29751555083966205e-5);
    tail = (0.3989422804014327 - tail) / y;
  } else {
    return x > 0 ? 1 : 0;
  }
  // Multiply by exp(−y²/2) in two pieces so that the rounding of y² does not spoil the tail:
  // y² = r² + (y − r)(y + r) with r = y rounded down to a multiple of 1/16.
  const rounded = Math.trunc(y * 16) / 16;
  const remainder = (y - rounded) * (y + rounded);
  tail *= Math.exp(-rounded * rounded * 0.5) * Math.exp(-remainder * 0.5);
  return x > 0 ? 1 - tail : tail;
}

/**
 * Standard normal quantile Φ⁻¹(p): the z with P(Z ≤ z) = p.
 * @param p A probability in [0, 1]; 0 gives −Infinity and 1 gives +Infinity.
 * @throws {RangeError} when p is NaN or outside [0, 1].
 * @returns The quantile z.
 * References: Wichura 1988, "Algorithm AS 241: The percentage points of the normal
 * distribution" (PPND16).
 */
export function normalQuantile(p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`normalQuantile: p must be a probability in [0, 1], got ${p}`);
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r + 67265.770927008700853) * r + 45921.953931549871457) * r +
          13731.693765509461125) *
          r +
          1971.5909503065514427) *
          r +
          133.14166789178437745) *
          r +
          3.387132872796366608)) /
      (((((((r * 5226.495278852854561 + 28729.085735721942674) * r + 39307.89580009271061) * r + 21213.794301586595867) * r +
        5394.1960214247511077) *
        r +
        687.1870074920579083) *
        r +
        42.313330701600911252) *
        r +
        1)
    );
  }
  // Tails: r = √(−log(min(p, 1 − p))).
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let value: number;
  if (r <= 5) {
    r -= 1.6;
    value =
      (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r + 0.24178072517745061177) * r + 1.27045825245236838258) * r +
        3.64784832476320460504) *
        r +
        5.7694972214606914055) *
        r +
        4.6303378461565452959) *
        r +
        1.42343711074968357734) /
      (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r + 0.14810397642748007459) * r +
        0.68976733498510000455) *
        r +
        1.6763848301838038494) *
        r +
        2.05319162663775882187) *
        r +
        1);
  } else {
    r -= 5;
    value =
      (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r + 0.026532189526576123093) * r +
        0.29656057182850489123) *
        r +
        1.7848265399172913358) *
        r +
        5.4637849111641143699) *
        r +
        6.6579046435011037772) /
      (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r + 7.868691311456132591e-4) * r +
        0.0148753612908506148525) *
        r +
        0.13692988092273580531) *
        r +
        0.59983220655588793769) *
        r +
        1);
  }
  return q < 0 ? -value : value;
}
