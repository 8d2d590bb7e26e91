// Seeded Gaussian noise for the simulated analyzer: the same seed gives the same readings, run after
// run. Uniform numbers come from a seeded generator (the one mathjs uses); the Box-Muller transform (common practice)
// turns pairs of them into independent standard normal numbers.
import { seededUniform } from '../src/numeric/seeded-uniform.js';

export class GaussianNoise {
  private readonly uniform: () => number;
  private spare: number | undefined;

  constructor(seed: number) {
    this.uniform = seededUniform(`topoprobe-bench-${seed}`);
  }

  /** One draw from the standard normal distribution (mean 0, standard deviation 1). */
  next(): number {
    if (this.spare !== undefined) {
      const value = this.spare;
      this.spare = undefined;
      return value;
    }
    const u1 = 1 - this.uniform(); // in (0, 1], so the logarithm is finite
    const u2 = this.uniform();
    const radius = Math.sqrt(-2 * Math.log(u1));
    this.spare = radius * Math.sin(2 * Math.PI * u2);
    return radius * Math.cos(2 * Math.PI * u2);
  }
}
