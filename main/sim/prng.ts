/**
 * Seeded pseudo-random numbers for the simulated bench, so that a seed
 * reproduces a run exactly. mulberry32 (a public-domain 32-bit generator by
 * Tommy Ettinger, from memory) is small and good enough for instrument noise;
 * Gaussian deviates come from the Box–Muller transform (common practice).
 */
export interface Rng {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal deviate (mean 0, σ 1). */
  gaussian(): number;
  /** An independent generator derived from this one's seed and a label. */
  fork(label: string): Rng;
}

function hashLabel(seed: number, label: string): number {
  // FNV-1a over the label, mixed with the seed (common practice for string hashing).
  let h = (0x811c9dc5 ^ seed) >>> 0;
  for (let i = 0; i < label.length; i++) {
    h ^= label.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

export function createRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new TypeError(`createRng: seed must be a finite number, got ${seed}`);
  const seed32 = Math.trunc(seed) >>> 0;
  let state = seed32;
  let spare: number | null = null;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return {
    uniform,
    gaussian(): number {
      if (spare !== null) {
        const value = spare;
        spare = null;
        return value;
      }
      let u = uniform();
      while (u === 0) u = uniform();
      const v = uniform();
      const r = Math.sqrt(-2 * Math.log(u));
      spare = r * Math.sin(2 * Math.PI * v);
      return r * Math.cos(2 * Math.PI * v);
    },
    fork(label: string): Rng {
      return createRng(hashLabel(seed32, label));
    },
  };
}
