import { createContext, useContext } from "react";

/**
 * This response's Content-Security-Policy nonce (app/security/policy.ts), put in context by
 * app/entry.server.tsx for the inline scripts React Router writes (Scripts, ScrollRestoration,
 * streamed data). In the browser it is empty: browsers hide a nonce from the page once loaded
 * (HTML Living Standard, "nonce attributes"), and hydration ignores it.
 */
export const NonceContext = createContext<string | undefined>(undefined);

export function useNonce(): string | undefined {
  return useContext(NonceContext);
}
