/**
 * Ports for `npm run demo`: the app and each local fake. A port named in the environment is used as
 * given and must be free (otherwise one clear error naming the variable); a port left to its default
 * moves to a free one when the default is taken, so two demos from two checkouts run side by side.
 */
import net from 'node:net';

export interface DemoPortSpec {
  /** The environment variable that sets this port. */
  variable: string;
  /** What listens there, for messages. */
  label: string;
  defaultPort: number;
}

export const DEMO_PORTS: readonly DemoPortSpec[] = [
  { variable: 'PORT', label: 'the app', defaultPort: 3000 },
  { variable: 'SMTP_PORT', label: 'the mail fake (SMTP)', defaultPort: 2525 },
  { variable: 'MAIL_FAKE_HTTP_PORT', label: 'the mail fake (outbox HTTP)', defaultPort: 2580 },
  { variable: 'PAYMENT_FAKE_PORT', label: 'the payment fake', defaultPort: 12111 },
];

export interface ResolvedPort extends DemoPortSpec {
  port: number;
  /** True when the default was taken and another free port was chosen. */
  moved: boolean;
}

export class DemoPortError extends Error {}

/** Whether nothing listens on 127.0.0.1:port (tries to bind it for a moment). */
export function isPortFree(port: number, host = '127.0.0.1'): Promise<boolean> {
  return new Promise((resolve) => {
    const srv = net.createServer();
    srv.once('error', () => resolve(false));
    srv.listen({ port, host, exclusive: true }, () => srv.close(() => resolve(true)));
  });
}

function anyFreePort(host = '127.0.0.1'): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, host, () => {
      const addr = srv.address();
      const port = typeof addr === 'object' && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Chooses every demo port, or throws a DemoPortError naming the variable to set. */
export async function resolveDemoPorts(
  env: NodeJS.ProcessEnv,
  specs: readonly DemoPortSpec[] = DEMO_PORTS,
): Promise<ResolvedPort[]> {
  const taken = new Set<number>();
  const out: ResolvedPort[] = [];
  for (const spec of specs) {
    const raw = env[spec.variable]?.trim();
    if (raw) {
      const port = Number(raw);
      if (!Number.isInteger(port) || port < 1 || port > 65_535) {
        throw new DemoPortError(
          `${spec.variable}=${raw} is not a port number (1-65535). Set ${spec.variable} to a free port for ${spec.label}.`,
        );
      }
      if (taken.has(port) || !(await isPortFree(port))) {
        throw new DemoPortError(
          `Port ${port} for ${spec.label} is in use by another program. Set ${spec.variable} to a free port (or unset it to let the demo choose one).`,
        );
      }
      taken.add(port);
      out.push({ ...spec, port, moved: false });
      continue;
    }
    if (!taken.has(spec.defaultPort) && (await isPortFree(spec.defaultPort))) {
      taken.add(spec.defaultPort);
      out.push({ ...spec, port: spec.defaultPort, moved: false });
      continue;
    }
    let port = await anyFreePort();
    while (taken.has(port)) port = await anyFreePort();
    taken.add(port);
    out.push({ ...spec, port, moved: true });
  }
  return out;
}

/** One line per port for the demo's banner, saying which moved from its default and why. */
export function describePorts(ports: readonly ResolvedPort[]): string[] {
  return ports.map(
    (p) =>
      `  ${p.label.padEnd(28)} 127.0.0.1:${p.port}${p.moved ? `  (${p.defaultPort} was taken; set ${p.variable} to choose)` : ''}`,
  );
}
