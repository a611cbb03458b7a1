// http_ece ships no types; the tests only decrypt what a push service would deliver.
declare module 'http_ece' {
  import type { ECDH } from 'node:crypto';
  export function decrypt(buffer: Buffer, params: { version: 'aes128gcm'; privateKey: ECDH; authSecret: Buffer }): Buffer;
}
