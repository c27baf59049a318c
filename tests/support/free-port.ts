import net from 'node:net';

/**
 * A TCP port on 127.0.0.1 that was free a moment ago (the OS picks it). Another process may take it
 * before the caller binds, which on one machine is rare enough for tests, benches and the runners.
 */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}
