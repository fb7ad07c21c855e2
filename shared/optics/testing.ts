/** Helpers shared by the engine's tests: seeded noise, tolerant comparisons, bytes and streams of a text. */
import { faker } from '@faker-js/faker';
import { expect } from 'vitest';
import { gaussian } from './synthetic.js';

/** A reproducible standard-normal source. */
export function seededNormal(seed: number): () => number {
  faker.seed(seed);
  // faker's floats lie in [0, 1): safe for the logarithm of Box-Muller.
  return gaussian(() => faker.number.float({ min: 0, max: 1 }));
}

/** A reproducible uniform source on [min, max). */
export function seededUniform(seed: number, min: number, max: number): () => number {
  faker.seed(seed);
  return () => faker.number.float({ min, max });
}

export function expectClose(actual: readonly number[], expected: readonly number[], tolerance: number): void {
  expect(actual.length).toBe(expected.length);
  actual.forEach((x, i) => expect(Math.abs(x - expected[i]), `entry ${i}: ${x} vs ${expected[i]}`).toBeLessThanOrEqual(tolerance));
}

/** The UTF-8 bytes of a text, as a file holds them. */
export const bytesOf = (text: string) => new TextEncoder().encode(text);

/** The bytes as a stream delivers them: in chunks of `size`. */
export async function* chunksOf(bytes: Uint8Array, size: number): AsyncGenerator<Uint8Array> {
  for (let start = 0; start < bytes.length; start += size) yield bytes.subarray(start, start + size);
}
