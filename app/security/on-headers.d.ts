declare module "on-headers" {
  import type { ServerResponse } from "node:http";
  /** Runs the listener once, just before the response writes its headers (expressjs/on-headers). */
  export default function onHeaders(res: ServerResponse, listener: (this: ServerResponse) => void): void;
}
