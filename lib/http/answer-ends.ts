import type http from "node:http";
import type { Socket } from "node:net";

/**
 * When an answer ends or its client goes. A response emits "close" when it ends or its connection
 * drops — except a response queued behind another on a connection that pipelines requests: Node
 * emits "request" for each pipelined request at once, attaches a response to the socket only when
 * the one before it has been sent, and when the connection drops only the attached one hears of it.
 * So work done for a queued answer (a request passed on to Next, a render slot, a search) also
 * listens to its socket's "close" — one listener per socket, whatever the number of requests on it.
 */

const waiting = new WeakMap<Socket, Set<() => void>>();

/** Calls `fn` once, when `res` closes or `req`'s connection does (at once when it has already). */
export function whenAnswerEnds(req: http.IncomingMessage, res: http.ServerResponse, fn: () => void): void {
  const socket = req.socket;
  let called = false;
  const once = () => {
    if (called) return;
    called = true;
    res.off("close", once);
    waiting.get(socket)?.delete(once);
    fn();
  };
  res.once("close", once);
  if (!socket) return;
  if (socket.destroyed) {
    queueMicrotask(once);
    return;
  }
  let set = waiting.get(socket);
  if (!set) {
    const callbacks = new Set<() => void>();
    waiting.set(socket, (set = callbacks));
    socket.once("close", () => {
      waiting.delete(socket);
      for (const callback of [...callbacks]) callback();
    });
  }
  set.add(once);
}

/** The client is gone: its answer was cut off, or its connection dropped while the answer waited its turn. */
export function clientGone(req: http.IncomingMessage, res: http.ServerResponse): boolean {
  return res.destroyed || req.socket?.destroyed === true;
}
