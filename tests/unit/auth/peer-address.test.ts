import http from 'node:http';
import type { AddressInfo } from 'node:net';
import bcrypt from 'bcryptjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { installPeerAddressStamp, normalizeAddress, PEER_HEADER, peerStampInstalled } from '@/lib/auth/peer-address';
import { clientAddress, UNKNOWN_ADDRESS } from '@/lib/auth/throttle';
import { DUMMY_PASSWORD_HASH, PASSWORD_COST } from '@/lib/auth/password';

describe('the caller address without a trusted proxy', () => {
  let server: http.Server;
  let port = 0;
  const seen: http.IncomingHttpHeaders[] = [];

  beforeAll(async () => {
    // created before the stamp is installed, as Next creates its server before instrumentation runs
    server = http.createServer((req, res) => {
      seen.push({ ...req.headers });
      res.end('ok');
    });
    await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
    port = (server.address() as AddressInfo).port;
  });
  afterAll(async () => new Promise<void>((resolve) => server.close(() => resolve())));

  it('is unknown until the server stamps the socket address, whatever the caller sends', () => {
    expect(peerStampInstalled()).toBe(false);
    expect(clientAddress(new Headers({ [PEER_HEADER]: '203.0.113.5', 'x-forwarded-for': '203.0.113.6' }), {})).toBe(UNKNOWN_ADDRESS);
  });

  it('is the socket address once stamped: a made-up x-haulcase-peer or X-Forwarded-For is replaced or ignored', async () => {
    installPeerAddressStamp();
    installPeerAddressStamp(); // once per process, however often it is called
    await fetch(`http://127.0.0.1:${port}/`, { headers: { [PEER_HEADER]: '203.0.113.5', 'x-forwarded-for': '203.0.113.6' } });
    const headers = seen[seen.length - 1];
    expect(headers[PEER_HEADER]).toBe('127.0.0.1');
    expect(clientAddress(headers as Record<string, string>, {})).toBe('127.0.0.1');
    // behind a trusted proxy its X-Forwarded-For entry wins
    expect(clientAddress(headers as Record<string, string>, { HAULCASE_TRUSTED_PROXY: '1' })).toBe('203.0.113.6');
  });

  it('reads IPv4 on an IPv6 socket as IPv4', () => {
    expect(normalizeAddress('::ffff:192.0.2.1')).toBe('192.0.2.1');
    expect(normalizeAddress('2001:db8::1')).toBe('2001:db8::1');
  });
});

describe('the dummy password hash', () => {
  it('has the cost of real hashes, so an unknown account takes as long as a wrong password', () => {
    expect(bcrypt.getRounds(DUMMY_PASSWORD_HASH)).toBe(PASSWORD_COST);
  });
});
