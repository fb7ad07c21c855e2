import { describe, expect, it } from 'vitest';
import { utf8Exceeds } from './text.js';

describe('the UTF-8 size of a text', () => {
  // Reference: the platform's UTF-8 encoder (TextEncoder, WHATWG Encoding Standard), which encodes
  // a lone surrogate as U+FFFD (three bytes).
  it('agrees with TextEncoder around the limit for one- to four-byte characters and lone surrogates', () => {
    for (const sample of ['QW-0001,632.8,H\n', 'é', '€', '𝛿', '\uD835', 'a\uDEFFb', 'mixed é € 𝛿 text']) {
      const text = sample.repeat(7);
      const bytes = new TextEncoder().encode(text).byteLength;
      for (const limit of [0, Math.floor(bytes / 2), bytes - 1, bytes, bytes + 1, 3 * text.length]) {
        expect(utf8Exceeds(text, limit), `${JSON.stringify(sample)} x 7 (${bytes} bytes) against ${limit}`).toBe(bytes > limit);
      }
    }
  });
});
