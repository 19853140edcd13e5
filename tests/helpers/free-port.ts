/** A free TCP port, in a module of its own so that scripts run without Vite (benches) can import it. */
import { createServer } from 'node:net';

/** A TCP port on 127.0.0.1 that nobody listens on right now. */
export function freePort(): Promise<number> {
  return new Promise((done, fail) => {
    const probe = createServer();
    probe.once('error', fail);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      probe.close(() => done(port));
    });
  });
}
