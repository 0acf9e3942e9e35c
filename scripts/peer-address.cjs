/**
 * Preloaded into the server process by the start and test commands (`node --require ./scripts/peer-address.cjs`).
 *
 * Next.js gives route handlers, server actions and proxy.ts no access to the socket: the peer's address reaches the
 * app only as X-Forwarded-For, and only when the client sent none (Next fills the header with `??=`), so a client
 * that sends its own X-Forwarded-For hides where it connects from. This hook stamps every incoming request with the
 * socket's peer address in `x-quell-peer-address`, overwriting anything the client sent under that name, before
 * Next sees the request; lib/auth/client-address.ts trusts that header only when this hook is loaded.
 */
"use strict";
const http = require("node:http");

const HEADER = "x-quell-peer-address";
const emit = http.Server.prototype.emit;
http.Server.prototype.emit = function quellStampPeer(event, req) {
  if (event === "request" && req && req.headers) {
    req.headers[HEADER] = (req.socket && req.socket.remoteAddress) || "";
  }
  return emit.apply(this, arguments);
};
globalThis[Symbol.for("quell.peerAddressHeader")] = HEADER;
