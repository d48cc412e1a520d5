/**
 * Drains an HTTP server for a clean stop: stop accepting connections, answer every request that
 * arrives on a connection already open (even one sent before the stop but not yet read), with
 * `Connection: close` so each connection ends after its answer, and only then close what is left.
 * http.Server#close would close "idle" keep-alive connections at once, and a connection whose next
 * request is still unread counts as idle: its client would see a reset.
 */
import type { Server } from 'node:http';
import net from 'node:net';

export interface DrainOptions {
  /** How long an idle connection may still bring a request after the stop began. */
  idleGraceMs?: number;
  /** After this long every connection is cut, so a stop never hangs. */
  hardLimitMs?: number;
}

/** Starts tracking the server's connections; call the result to drain. */
export function drainable(server: Server): (options?: DrainOptions) => Promise<void> {
  const active = new Map<net.Socket, number>();
  const idleSince = new Map<net.Socket, number>();
  let draining = false;

  server.on('connection', (socket: net.Socket) => {
    active.set(socket, 0);
    idleSince.set(socket, Date.now());
    socket.once('close', () => {
      active.delete(socket);
      idleSince.delete(socket);
    });
  });
  server.on('request', (req, res) => {
    const socket = req.socket;
    active.set(socket, (active.get(socket) ?? 0) + 1);
    if (draining && !res.headersSent) res.setHeader('Connection', 'close');
    res.once('close', () => {
      active.set(socket, (active.get(socket) ?? 1) - 1);
      idleSince.set(socket, Date.now());
    });
  });

  return ({ idleGraceMs = 1000, hardLimitMs = 10_000 } = {}) =>
    new Promise<void>((resolve) => {
      draining = true;
      const started = Date.now();
      // The net.Server close: stop listening, leave open connections to finish.
      net.Server.prototype.close.call(server, () => {
        clearInterval(sweep);
        resolve();
      });
      const sweep = setInterval(() => {
        const now = Date.now();
        for (const [socket, count] of active) {
          const quiet = now - Math.max(started, idleSince.get(socket) ?? started);
          if ((count === 0 && quiet >= idleGraceMs) || now - started >= hardLimitMs) {
            socket.destroy();
          }
        }
      }, 50);
    });
}
