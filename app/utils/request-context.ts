// Values the HTTP server hands to every request through React Router's context (middleware is
// on), and the React context that carries the CSP nonce into the document. Not `.server`: the
// root layout reads the nonce while rendering on both sides (it is empty in the browser).
import { createContext as createReactContext, useContext } from "react";
import { createContext, RouterContextProvider } from "react-router";

/** The per-response nonce that the Content-Security-Policy allows for inline scripts. */
export const cspNonceContext = createContext<string | undefined>(undefined);

/**
 * Builds the router context for one request. server.ts calls this through the server build
 * (`build.entry.module.createLoadContext`), so the context keys are the bundle's own objects.
 */
export function createRequestContext(values: { cspNonce?: string }): RouterContextProvider {
  const context = new RouterContextProvider();
  if (values.cspNonce) context.set(cspNonceContext, values.cspNonce);
  return context;
}

const NonceContext = createReactContext<string | undefined>(undefined);
export const NonceProvider = NonceContext.Provider;
export const useNonce = () => useContext(NonceContext);
