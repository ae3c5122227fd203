import { data, type MiddlewareFunction } from "react-router";
import { judgeBody } from "./policy";

/**
 * Root middleware: the body-size policy of app/security/policy.ts for every action, wherever
 * the app is served. The production server already refuses an oversize body before React
 * Router sees it (app/security/server.ts); this keeps the same rule under the dev server and
 * any other adapter.
 */
export const bodyLimit: MiddlewareFunction<Response> = async ({ request }, next) => {
  const verdict = judgeBody(request.method, new URL(request.url).pathname, {
    contentLength: request.headers.get("Content-Length"),
    transferEncoding: request.headers.get("Transfer-Encoding"),
  });
  if (!verdict.ok) throw data({ message: verdict.message }, { status: verdict.status });
  return next();
};
