import http from 'node:http';
import https from 'node:https';

/**
 * Route handlers in Next get a Request without its socket, and Next fills
 * X-Forwarded-For from the socket only when the caller did not send one, so
 * that header cannot tell a caller's address from one it made up. This stamps
 * the socket's remote address on every incoming request as `x-haulcase-peer`,
 * replacing whatever the caller sent under that name, before Next reads the
 * headers. Installed once per process from instrumentation.ts (which runs in the
 * server's process before it answers); `clientAddress` reads the header only
 * when the stamp is installed in this process.
 */
export const PEER_HEADER = 'x-haulcase-peer';

const holder = globalThis as unknown as { __haulcasePeerStamp?: boolean };

export const peerStampInstalled = (): boolean => holder.__haulcasePeerStamp === true;

/** `::ffff:192.0.2.1` (IPv4 on an IPv6 socket) reads as `192.0.2.1`. */
export const normalizeAddress = (a: string): string => a.replace(/^::ffff:(\d+\.\d+\.\d+\.\d+)$/i, '$1');

export function installPeerAddressStamp(): void {
  if (peerStampInstalled()) return;
  for (const proto of [http.Server.prototype, https.Server.prototype]) {
    const emit = proto.emit;
    proto.emit = function stampPeer(this: unknown, event: string | symbol, ...args: unknown[]) {
      if (event === 'request' || event === 'checkContinue' || event === 'checkExpectation') {
        const req = args[0] as http.IncomingMessage | undefined;
        if (req?.headers) {
          const remote = req.socket?.remoteAddress;
          if (remote) req.headers[PEER_HEADER] = normalizeAddress(remote);
          else delete req.headers[PEER_HEADER];
        }
      }
      return (emit as (this: unknown, event: string | symbol, ...args: unknown[]) => boolean).apply(this, [event, ...args]);
    } as typeof proto.emit;
  }
  holder.__haulcasePeerStamp = true;
}
