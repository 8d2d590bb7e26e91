// Reproducible uniform numbers in [0, 1) from a seed string. seedrandom is the generator behind mathjs's
// `randomSeed`, so these are the very numbers `create(..., { randomSeed }).random()` gives, without loading
// the whole of mathjs (about 90 MB resident) into a runner or a simulated bench that needs nothing else of it.
import seedrandom from 'seedrandom';

export function seededUniform(seed: string): () => number {
  const rng = seedrandom(seed);
  return () => rng();
}
