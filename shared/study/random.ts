/**
 * Seeded random streams of a study. Every sample (and every Latin-hypercube
 * column) gets its own stream, keyed by the study seed, a stream tag and its
 * index, so a sample's draws depend on nothing else: not on the chunk it
 * falls in, the chunk size, nor the worker or order that ran it. The
 * generators and the normal and uniform variates are d3-random's
 * (randomLcg, randomNormal, randomUniform); the key is mixed by MurmurHash3's
 * 32-bit finaliser (Appleby, public domain, from memory).
 */
import { randomLcg, randomNormal, randomUniform } from 'd3';

function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** A seed in [0, 1) for randomLcg from (study seed, stream tag, index). */
export function streamSeed(seed: number, tag: number, index: number): number {
  let h = fmix32((seed >>> 0) ^ 0x9e3779b9);
  h = fmix32(h ^ Math.imul(tag + 1, 0x27d4eb2f));
  h = fmix32(h ^ (index >>> 0));
  h = fmix32(h ^ Math.floor(index / 0x1_0000_0000));
  return h / 0x1_0000_0000;
}

export const STREAM_SAMPLE = 1;
export const STREAM_LHS = 2;

export interface Stream {
  /** Standard normal variate. */
  normal: () => number;
  /** Uniform on [−1, 1). */
  symmetric: () => number;
  /** Uniform on [0, 1). */
  unit: () => number;
}

export function stream(seed: number, tag: number, index: number): Stream {
  const source = randomLcg(streamSeed(seed, tag, index));
  return { normal: randomNormal.source(source)(0, 1), symmetric: randomUniform.source(source)(-1, 1), unit: source };
}

/** A random permutation of 0…n−1 (Fisher–Yates) from its own stream. */
export function permutation(n: number, seed: number, tag: number, index: number): Int32Array {
  const u = randomLcg(streamSeed(seed, tag, index));
  const p = new Int32Array(n);
  for (let i = 0; i < n; i++) p[i] = i;
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(u() * (i + 1));
    const t = p[i]!;
    p[i] = p[j]!;
    p[j] = t;
  }
  return p;
}
