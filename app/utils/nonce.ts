// The per-request CSP nonce (app/entry.server.tsx) for the few inline scripts we write ourselves;
// React Router's own take theirs from <ServerRouter nonce>. Undefined in the browser, which
// hides nonces from the page anyway.
import { createContext, useContext } from "react";

export const NonceContext = createContext<string | undefined>(undefined);

export function useNonce(): string | undefined {
  return useContext(NonceContext);
}
