/**
 * Seeded pseudo-random numbers, so that the same seed gives the same physics and the
 * same bytes. The generator is sfc32 (Chris Doty-Humphrey's "small fast counting"
 * generator from the PractRand suite, public domain); seeds are spread with splitmix32
 * so that neighbouring seeds give unrelated streams.
 */
export interface Prng {
  /** A uniform number in [0, 1). */
  next(): number;
  /** A normally distributed number with mean 0 and standard deviation 1. */
  gaussian(): number;
  /** A uniform number in [-1, 1). */
  symmetric(): number;
}

const UINT32_RANGE = 4294967296;
const WARM_UP_ROUNDS = 12;

function splitmix32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x9e3779b9) >>> 0;
    let z = state;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

/** Creates a deterministic generator from a seed and a stream name (physics, meter, ...). */
export function createPrng(seed: number, stream = ''): Prng {
  let mixed = seed >>> 0;
  for (const ch of stream) mixed = Math.imul(mixed ^ ch.charCodeAt(0), 0x01000193) >>> 0;
  const spread = splitmix32(mixed);
  let a = spread();
  let b = spread();
  let c = spread();
  let d = spread();
  const nextUint = (): number => {
    const t = (((a + b) >>> 0) + d) >>> 0;
    d = (d + 1) >>> 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) >>> 0;
    c = ((c << 21) | (c >>> 11)) >>> 0;
    c = (c + t) >>> 0;
    return t;
  };
  for (let i = 0; i < WARM_UP_ROUNDS; i += 1) nextUint();
  const next = (): number => nextUint() / UINT32_RANGE;
  return {
    next,
    symmetric: () => next() * 2 - 1,
    // Box-Muller: two uniforms give one normal deviate; 1 - u keeps log() away from 0.
    gaussian: () => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next()),
  };
}
