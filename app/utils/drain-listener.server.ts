// One "drain" listener per compressed response, for every wait on it.
//
// The compression middleware sends `res.on("drain")` to its zlib stream but leaves
// `res.removeListener`/`res.off` on the response (expressjs/compression#135, open). React Router
// writes a streamed body with `res.once("drain")` after every write that fills the buffer, and
// removes the listener with `res.off`; under compression each of those listeners stayed on the
// zlib stream until the response ended, and a long body over a slow connection printed a
// MaxListenersExceededWarning. Here `once`/`off` for "drain" are kept in a set, served by a single
// listener registered through compression's `on` the first time one is asked for.
import type { RequestHandler } from "express";

type Listener = (...args: unknown[]) => void;

export const oneDrainListener: RequestHandler = (_req, res, next) => {
  const waiting = new Set<Listener>();
  let listening = false;
  const once = res.once;
  const removeListener = res.removeListener;
  res.once = function (this: typeof res, event: string | symbol, listener: Listener) {
    if (event !== "drain") return once.call(this, event, listener);
    waiting.add(listener);
    if (!listening) {
      listening = true;
      res.on("drain", () => {
        const due = [...waiting];
        waiting.clear();
        for (const l of due) l();
      });
    }
    return this;
  } as typeof res.once;
  res.off = res.removeListener = function (this: typeof res, event: string | symbol, listener: Listener) {
    if (event === "drain" && waiting.delete(listener)) return this;
    return removeListener.call(this, event, listener);
  } as typeof res.removeListener;
  next();
};
