// The web-platform globals shared/ may use, which browsers and Node (18 and later) both provide.
// Only tsconfig.shared.json reads this file: the client's DOM types and the server's Node types
// declare the same globals in full.
interface TextEncoder {
  encode(input?: string): Uint8Array;
}
declare const TextEncoder: { prototype: TextEncoder; new (): TextEncoder };

interface TextDecoder {
  decode(input?: ArrayBufferView | ArrayBuffer, options?: { stream?: boolean }): string;
}
declare const TextDecoder: { prototype: TextDecoder; new (label?: string, options?: { fatal?: boolean; ignoreBOM?: boolean }): TextDecoder };

interface Crypto {
  getRandomValues<T extends ArrayBufferView>(array: T): T;
}
declare const crypto: Crypto;
