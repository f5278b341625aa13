/**
 * A small, fast, seedable pseudo-random generator, so that parallel analysis, bootstrap
 * resamples and the synthetic demo data repeat exactly for the same seed.
 *
 * The generator is xoshiro128** (32-bit state words), seeded through SplitMix32 so that any
 * integer seed, including 0, gives a well-mixed state. Doubles take 53 random bits from two
 * outputs. Normal variates use Marsaglia's polar method.
 *
 * References: Blackman & Vigna 2021, "Scrambled linear pseudorandom number generators"
 * (ACM TOMS 47:36); Steele, Lea & Flood 2014, "Fast splittable pseudorandom number generators"
 * (SplitMix); Marsaglia & Bray 1964, "A convenient method for generating normal variables".
 */
export interface SeededRandom {
  /** Uniform double in [0, 1) with 53 random bits. */
  next(): number;
  /** Uniform integer in [0, bound) without modulo bias. @throws RangeError unless 1 <= bound <= 2^32. */
  nextInt(bound: number): number;
  /** Standard normal variate (mean 0, SD 1). */
  nextNormal(): number;
  /** The seed this generator started from. */
  readonly seed: number;
}

function splitMix32(state: number): () => number {
  let s = state >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/**
 * Creates a generator from an integer seed.
 * @param seed Any finite integer (taken modulo 2^32).
 * @throws {RangeError} when the seed is not a finite integer.
 * @returns A generator; two generators with the same seed give the same sequence.
 * References: Blackman & Vigna 2021, "Scrambled linear pseudorandom number generators".
 */
export function createSeededRandom(seed: number): SeededRandom {
  if (!Number.isInteger(seed)) throw new RangeError(`createSeededRandom: seed must be a finite integer, got ${seed}`);
  const mix = splitMix32(seed);
  let a = mix();
  let b = mix();
  let c = mix();
  let d = mix();
  if ((a | b | c | d) === 0) a = 1;

  const nextUint32 = (): number => {
    const result = Math.imul(rotl(Math.imul(b, 5), 7), 9) >>> 0;
    const t = b << 9;
    c ^= a;
    d ^= b;
    b ^= c;
    a ^= d;
    c ^= t;
    d = rotl(d, 11);
    return result;
  };

  let spareNormal: number | null = null;

  const next = (): number => {
    const high = nextUint32() >>> 5; // 27 bits
    const low = nextUint32() >>> 6; // 26 bits
    return (high * 67108864 + low) / 9007199254740992;
  };

  return {
    seed,
    next,
    nextInt(bound: number): number {
      if (!Number.isInteger(bound) || bound < 1 || bound > 4294967296) {
        throw new RangeError(`nextInt: bound must be an integer from 1 to 2^32, got ${bound}`);
      }
      const limit = 4294967296 - (4294967296 % bound);
      let value = nextUint32();
      while (value >= limit) value = nextUint32();
      return value % bound;
    },
    nextNormal(): number {
      if (spareNormal !== null) {
        const value = spareNormal;
        spareNormal = null;
        return value;
      }
      let u = 0;
      let v = 0;
      let s = 0;
      do {
        u = 2 * next() - 1;
        v = 2 * next() - 1;
        s = u * u + v * v;
      } while (s >= 1 || s === 0);
      const factor = Math.sqrt((-2 * Math.log(s)) / s);
      spareNormal = v * factor;
      return u * factor;
    },
  };
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}
