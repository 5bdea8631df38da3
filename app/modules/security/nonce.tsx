// The per-request nonce of the Content-Security-Policy, handed from the server entry to the document's
// inline scripts. In the browser it is empty: browsers hide nonces from the DOM once the page is parsed.
import { createContext, useContext } from "react";

const NonceContext = createContext<string | undefined>(undefined);

export const NonceProvider = NonceContext.Provider;

export function useNonce(): string | undefined {
  return useContext(NonceContext);
}
