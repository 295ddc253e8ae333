// A TCP relay between the app and PostgreSQL that a test can cut and restore, to act out the
// database going away and coming back.
import { createServer, connect, type AddressInfo, type Server, type Socket } from 'node:net';

export interface TcpProxy {
  port: number;
  cut: () => Promise<void>;
  restore: () => Promise<void>;
  close: () => Promise<void>;
}

export async function startTcpProxy(targetHost: string, targetPort: number): Promise<TcpProxy> {
  const sockets = new Set<Socket>();
  let server: Server;
  let port = 0;
  const listen = () =>
    new Promise<void>((resolve) => {
      server = createServer((client) => {
        const upstream = connect(targetPort, targetHost);
        for (const s of [client, upstream]) {
          sockets.add(s);
          s.on('close', () => sockets.delete(s));
          s.on('error', () => s.destroy());
        }
        client.pipe(upstream).pipe(client);
      });
      server.listen(port, '127.0.0.1', () => {
        port = (server.address() as AddressInfo).port;
        resolve();
      });
    });
  const stop = () =>
    new Promise<void>((resolve) => {
      for (const s of sockets) s.destroy();
      server.close(() => resolve());
    });
  await listen();
  return { port, cut: stop, restore: listen, close: stop };
}
