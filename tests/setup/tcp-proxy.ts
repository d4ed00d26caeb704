import net from "node:net";

/** A loopback TCP proxy to `targetPort` that a test can cut (as if the server died) and restore. */
export interface TcpProxy {
  port: number;
  /** Refuses new connections and drops the open ones. */
  cut(): Promise<void>;
  /** Accepts connections again, on the same port. */
  restore(): Promise<void>;
  close(): Promise<void>;
}

/** Starts the proxy on a free loopback port. */
export async function startTcpProxy(targetPort: number): Promise<TcpProxy> {
  const open = new Set<net.Socket>();
  let server: net.Server | null = null;
  let port = 0;
  const listen = () =>
    new Promise<void>((resolve, reject) => {
      const s = net.createServer((client) => {
        const upstream = net.connect(targetPort, "127.0.0.1");
        for (const sock of [client, upstream]) {
          open.add(sock);
          sock.on("close", () => open.delete(sock));
          sock.on("error", () => {
            client.destroy();
            upstream.destroy();
          });
        }
        client.pipe(upstream).pipe(client);
      });
      s.once("error", reject);
      s.listen(port, "127.0.0.1", () => {
        port = (s.address() as net.AddressInfo).port;
        server = s;
        resolve();
      });
    });
  const cut = async () => {
    const s = server;
    server = null;
    for (const sock of open) sock.destroy();
    if (s) await new Promise<void>((r) => s.close(() => r()));
  };
  await listen();
  return {
    get port() {
      return port;
    },
    cut,
    restore: listen,
    close: cut,
  };
}
