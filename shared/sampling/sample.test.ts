import { describe, expect, it } from 'vitest';
import { drawSample, hashSeed, newSampleSeed } from './sample';

const lot = Array.from({ length: 500 }, (_, i) => `WP-${String(i + 1).padStart(4, '0')}`);

describe('seed hash', () => {
  it('is FNV-1a 32-bit', () => {
    // Published FNV-1a 32-bit test vectors (from memory): "" → 0x811c9dc5, "a" → 0xe40c292c, "foobar" → 0xbf9cf968.
    expect(hashSeed('')).toBe(0x811c9dc5);
    expect(hashSeed('a')).toBe(0xe40c292c);
    expect(hashSeed('foobar')).toBe(0xbf9cf968);
  });

  it('takes a number as its decimal text', () => {
    expect(hashSeed(42)).toBe(hashSeed('42'));
  });
});

describe('drawSample', () => {
  it('draws the same pieces for the same seed', () => {
    expect(drawSample(lot, 50, 'lot-17')).toEqual(drawSample(lot, 50, 'lot-17'));
    expect(drawSample(lot, 50, 9001)).toEqual(drawSample(lot, 50, 9001));
  });

  it('keeps drawing what it drew when the seed was stored', () => {
    // This module's own output, pinned: a change to the algorithm would silently change stored samples.
    expect(drawSample(lot, 5, 'pinned-seed')).toEqual(['WP-0022', 'WP-0129', 'WP-0224', 'WP-0242', 'WP-0354']);
  });

  it('draws n distinct pieces of the lot, in the lot order', () => {
    const sample = drawSample(lot, 80, 'c0ffee');
    expect(sample).toHaveLength(80);
    expect(new Set(sample).size).toBe(80);
    const positions = sample.map((serial) => lot.indexOf(serial));
    expect(positions.every((position) => position >= 0)).toBe(true);
    expect(positions).toEqual([...positions].sort((a, b) => a - b));
  });

  it('draws different pieces for different seeds', () => {
    const samples = ['a', 'b', 'c', 'd', 'e', '1', '2'].map((seed) => drawSample(lot, 50, seed).join(','));
    expect(new Set(samples).size).toBe(samples.length);
  });

  it('gives every piece about the same chance', () => {
    // 2000 draws of 10 from 20: each piece is expected 1000 times; binomial sd ≈ 22, so ±120 is over 5 sd.
    const small = lot.slice(0, 20);
    const counts = new Map(small.map((serial) => [serial, 0]));
    for (let seed = 0; seed < 2000; seed++) for (const serial of drawSample(small, 10, seed)) counts.set(serial, (counts.get(serial) ?? 0) + 1);
    for (const count of counts.values()) expect(Math.abs(count - 1000)).toBeLessThan(120);
  });

  it('returns the whole lot when n = N, and nothing when n = 0', () => {
    expect(drawSample(lot, lot.length, 's')).toEqual(lot);
    expect(drawSample(lot, 0, 's')).toEqual([]);
  });

  it('refuses a sample larger than the lot, duplicate serials and an empty seed', () => {
    expect(() => drawSample(lot, 501, 's')).toThrow(/cannot draw 501 pieces from a lot of 500/);
    expect(() => drawSample(['A1', 'A1', 'A2'], 2, 's')).toThrow(/distinct/);
    expect(() => drawSample(lot, 5, '')).toThrow(/seed/);
    expect(() => drawSample(lot, 2.5, 's')).toThrow(/whole number/);
  });
});

describe('newSampleSeed', () => {
  it('gives 16 hex digits, different each time', () => {
    const seeds = Array.from({ length: 20 }, newSampleSeed);
    for (const seed of seeds) expect(seed).toMatch(/^[0-9a-f]{16}$/);
    expect(new Set(seeds).size).toBe(20);
  });
});
