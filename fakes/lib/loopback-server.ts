import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';

/** Listens on 127.0.0.1 (port 0 picks a free one) and answers the port; a failed listen rejects. */
export async function listenOnLoopback(server: Server, port = 0): Promise<number> {
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject);
      resolve();
    });
  });
  return (server.address() as AddressInfo).port;
}

/** Stops listening and drops kept-alive connections, so the close does not wait for idle clients. */
export function closeServer(server: Server): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    server.close((err) => (err ? reject(err) : resolve()));
    server.closeAllConnections();
  });
}
