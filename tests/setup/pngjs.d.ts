/** The part of pngjs 5 (which ships no types) the certificate tests use to read a PNG. */
declare module "pngjs" {
  export const PNG: { sync: { read(buffer: Buffer): { width: number; height: number; data: Buffer } } };
}
