// The part of seedrandom 3 (David Bau's seeded ARC4 generator, the one mathjs uses for its randomSeed) we use.
declare module 'seedrandom' {
  interface SeededRandom {
    (): number;
  }
  export default function seedrandom(seed: string): SeededRandom;
}
