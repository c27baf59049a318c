/**
 * Debian's PostgreSQL as a throwaway cluster for `npm run test:pg`, `npm run test:scale` and
 * `npm run bench:scale`: run as the `postgres` user in a temporary folder, on a free loopback port,
 * with durability off (fsync, synchronous commit) since the data dies with the run.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from './free-port';

/** The bin folder of the newest installed Debian PostgreSQL, or null when there is none. */
export function pgBinDir(): string | null {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs
    .readdirSync(base)
    .filter((v) => fs.existsSync(path.join(base, v, 'bin', 'initdb')))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

/** Runs a PostgreSQL binary as the postgres user (initdb and the server refuse to run as root). */
export function asPostgres(bin: string, args: string[], opts: { stdio?: 'inherit' | 'pipe' } = {}): void {
  const asRoot = process.getuid?.() === 0;
  const [cmd, argv] = asRoot ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  const r = spawnSync(cmd, argv, { stdio: opts.stdio ?? 'pipe', encoding: 'utf8', cwd: os.tmpdir() });
  if (r.status !== 0)
    throw new Error(`${path.basename(bin)} ${args.join(' ')} failed:\n${r.stdout ?? ''}${r.stderr ?? ''}`);
}

export interface ScratchPostgres {
  port: number;
  /** The `postgres` database, for CREATE DATABASE. */
  adminUrl: string;
  /** Stops the server fast; a failure is printed after `label`, not thrown. Removing the folder is the caller's. */
  stop: (label: string) => void;
}

/**
 * Starts a cluster with its data and socket folders inside `work` (handed to the postgres user when
 * this runs as root), with `settings` as further `-c name=value` server options.
 */
export async function startScratchPostgres(bin: string, work: string, settings: string[]): Promise<ScratchPostgres> {
  const data = path.join(work, 'data');
  const sock = path.join(work, 'sock');
  fs.mkdirSync(sock);
  if (process.getuid?.() === 0) execFileSync('chown', ['-R', 'postgres:postgres', work]);
  const port = await freePort();
  asPostgres(path.join(bin, 'initdb'), [
    '-D',
    data,
    '-A',
    'trust',
    '-U',
    'postgres',
    '-E',
    'UTF8',
    '--locale=C',
    '--no-sync',
  ]);
  const options = [
    `-p ${port} -c listen_addresses=127.0.0.1 -k ${sock} -c fsync=off -c synchronous_commit=off`,
    ...settings.map((s) => `-c ${s}`),
  ].join(' ');
  asPostgres(path.join(bin, 'pg_ctl'), ['-D', data, '-l', path.join(work, 'server.log'), '-o', options, '-w', 'start']);
  return {
    port,
    adminUrl: `postgres://postgres@127.0.0.1:${port}/postgres`,
    stop: (label) => {
      try {
        asPostgres(path.join(bin, 'pg_ctl'), ['-D', data, '-m', 'fast', '-w', 'stop']);
      } catch (err) {
        console.error(`${label}: ${(err as Error).message}`);
      }
    },
  };
}
