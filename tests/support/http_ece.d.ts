// Minimal types for the part of http_ece (RFC 8188 / RFC 8291) the fake push service uses.
declare module "http_ece" {
  import type { ECDH } from "node:crypto";
  const ece: {
    decrypt(buffer: Buffer, params: { version: "aes128gcm"; privateKey: ECDH; authSecret: string | Buffer }): Buffer;
  };
  export default ece;
}
