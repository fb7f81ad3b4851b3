import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { freePort } from '../../support/ports';

const root = path.resolve(__dirname, '..', '..', '..');

export type Server = { base: string; process: ChildProcess; output: () => string; exited: number | null };

/** `next start` from the browser tests' build, with the given environment; resolves when it answers or exits. */
export async function startServer(env: Record<string, string>): Promise<Server> {
  const port = await freePort();
  const child = spawn(path.join(root, 'node_modules/.bin/next'), ['start', '-p', String(port), '-H', '127.0.0.1'], {
    cwd: root,
    env: { ...process.env, NEXT_DIST_DIR: process.env.NEXT_DIST_DIR || '.next-e2e', NODE_ENV: 'production', NEXT_TELEMETRY_DISABLED: '1', HAULCASE_MC_PREWARM: '0', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout!.on('data', (d) => (out += d));
  child.stderr!.on('data', (d) => (out += d));
  const base = `http://127.0.0.1:${port}`;
  for (let i = 0; i < 240; i++) {
    if (child.exitCode !== null) return { base, process: child, output: () => out, exited: child.exitCode };
    try {
      if ((await fetch(`${base}/sign-in`)).ok) return { base, process: child, output: () => out, exited: null };
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  child.kill('SIGTERM');
  throw new Error(`next start did not answer within 60 s:\n${out}`);
}
