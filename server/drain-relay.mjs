// Plain JavaScript, like server/index.mjs, so that production runs it with Node alone.

/**
 * compression routes `res.on("drain")` to its zlib stream but leaves `res.off` on the response, so a
 * listener added with `once` and removed with `off` (as React Router's stream writer does each time the
 * client is slower than the page) stays on the zlib stream: a large compressed page piles up listeners and
 * logs MaxListenersExceededWarning. Here the response keeps its own set of drain listeners and hands
 * compression a single relay; `off` and `once` then work as on any stream.
 */
export function oneDrainListenerPerWait(request, response, next) {
  const listeners = new Set();
  const on = response.on;
  const removeListener = response.removeListener;
  let relaying = false;
  response.on = response.addListener = function (type, listener) {
    if (type !== "drain") return on.call(this, type, listener);
    listeners.add(listener);
    if (!relaying) {
      relaying = true;
      on.call(this, "drain", () => {
        for (const each of [...listeners]) each.call(response);
      });
    }
    return this;
  };
  response.removeListener = response.off = function (type, listener) {
    if (type !== "drain") return removeListener.call(this, type, listener);
    for (const each of listeners) if (each === listener || each.listener === listener) listeners.delete(each);
    return this;
  };
  next();
}
