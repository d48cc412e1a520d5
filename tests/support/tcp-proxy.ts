/**
 * A TCP proxy in front of PostgreSQL that a test can cut (every open connection reset, new ones
 * refused) and restore, standing for a database outage without stopping the shared test cluster.
 */
import net from 'node:net';

export interface TcpProxy {
  port: number;
  /** Resets every connection and refuses new ones until restore(). */
  cut: () => void;
  restore: () => void;
  close: () => Promise<void>;
}

export async function tcpProxy(targetHost: string, targetPort: number): Promise<TcpProxy> {
  let down = false;
  const open = new Set<net.Socket>();
  const server = net.createServer((client) => {
    if (down) {
      client.resetAndDestroy();
      return;
    }
    const upstream = net.connect(targetPort, targetHost);
    open.add(client).add(upstream);
    const drop = () => {
      client.destroy();
      upstream.destroy();
      open.delete(client);
      open.delete(upstream);
    };
    client.on('error', drop).on('close', drop);
    upstream.on('error', drop).on('close', drop);
    client.pipe(upstream).pipe(client);
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as net.AddressInfo;
  return {
    port,
    cut: () => {
      down = true;
      for (const s of open) s.resetAndDestroy();
      open.clear();
    },
    restore: () => {
      down = false;
    },
    close: () =>
      new Promise((resolve) => {
        for (const s of open) s.destroy();
        server.close(() => resolve());
      }),
  };
}
