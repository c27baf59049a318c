import net from 'node:net';
import { afterEach, describe, expect, it } from 'vitest';
import {
  DEMO_PORTS,
  DemoPortError,
  describePorts,
  isPortFree,
  resolveDemoPorts,
  type DemoPortSpec,
} from '@/lib/fakes/demo-ports';

const held: net.Server[] = [];

/** Occupies a free port on 127.0.0.1 the way another program would, and returns it. */
function occupy(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      held.push(srv);
      const addr = srv.address();
      resolve(typeof addr === 'object' && addr ? addr.port : 0);
    });
  });
}

afterEach(async () => {
  await Promise.all(held.splice(0).map((s) => new Promise((r) => s.close(r))));
});

async function specsOnTakenDefaults(): Promise<DemoPortSpec[]> {
  // Each spec's default is a port another program already holds (the fixed defaults may be free or
  // not on a shared machine, so the test makes its own taken defaults).
  return Promise.all(DEMO_PORTS.map(async (s) => ({ ...s, defaultPort: await occupy() })));
}

describe('demo ports', () => {
  it('the defaults are the documented ones: app 3000, SMTP 2525, outbox 2580, payment fake 12111', () => {
    expect(DEMO_PORTS.map((p) => [p.variable, p.defaultPort])).toEqual([
      ['PORT', 3000],
      ['SMTP_PORT', 2525],
      ['MAIL_FAKE_HTTP_PORT', 2580],
      ['PAYMENT_FAKE_PORT', 12111],
    ]);
  });

  it('moves every port whose default is taken to a distinct free port, and says so in the banner', async () => {
    const specs = await specsOnTakenDefaults();
    const ports = await resolveDemoPorts({ NODE_ENV: 'production' }, specs);
    expect(ports.every((p) => p.moved)).toBe(true);
    expect(new Set(ports.map((p) => p.port)).size).toBe(specs.length);
    for (const p of ports) {
      expect(p.port).not.toBe(p.defaultPort);
      expect(await isPortFree(p.port)).toBe(true);
    }
    const banner = describePorts(ports).join('\n');
    for (const p of ports)
      expect(banner).toContain(`127.0.0.1:${p.port}  (${p.defaultPort} was taken; set ${p.variable} to choose)`);
  });

  it('two demos side by side: the second, started while the first holds its ports, gets other ports', async () => {
    const specs = await specsOnTakenDefaults();
    const first = await resolveDemoPorts({ NODE_ENV: 'production' }, specs);
    for (const p of first)
      await new Promise<void>((resolve) => {
        const srv = net.createServer();
        srv.listen(p.port, '127.0.0.1', () => {
          held.push(srv);
          resolve();
        });
      });
    const second = await resolveDemoPorts({ NODE_ENV: 'production' }, specs);
    const firstPorts = new Set(first.map((p) => p.port));
    expect(second.some((p) => firstPorts.has(p.port))).toBe(false);
  });

  it('keeps a free default as it is', async () => {
    const free = await occupy();
    await new Promise((r) => held.pop()?.close(r));
    const [p] = await resolveDemoPorts({ NODE_ENV: 'production' }, [
      { variable: 'PORT', label: 'the app', defaultPort: free },
    ]);
    expect(p).toMatchObject({ port: free, moved: false });
  });

  it('a port set in the environment that is taken stops with one message naming the variable', async () => {
    const taken = await occupy();
    const run = resolveDemoPorts(
      { NODE_ENV: 'production', SMTP_PORT: String(taken) },
      DEMO_PORTS.filter((p) => p.variable === 'SMTP_PORT'),
    );
    await expect(run).rejects.toThrow(DemoPortError);
    await expect(run).rejects.toThrow(
      new RegExp(`Port ${taken} for the mail fake \\(SMTP\\) is in use.*Set SMTP_PORT to a free port`),
    );
  });

  it('a port variable that is not a number names the variable', async () => {
    await expect(resolveDemoPorts({ NODE_ENV: 'production', PAYMENT_FAKE_PORT: 'twelve' }, DEMO_PORTS)).rejects.toThrow(
      /PAYMENT_FAKE_PORT=twelve is not a port number/,
    );
  });
});
