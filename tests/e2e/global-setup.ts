import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { TestProject } from 'vitest/node';
import { createKnex } from '../../lib/db/connection';
import { seedDemo } from '../../db/seeds/demo';
import { freePort } from '../support/ports';

declare module 'vitest' {
  export interface ProvidedContext {
    baseURL: string;
    e2eDataDir: string;
  }
}

const root = path.resolve(__dirname, '..', '..');

/**
 * Browser tests run against a production build: `next build` into its own folder
 * (E2E_REUSE_BUILD=1 skips the build when one is there), a fresh SQLite database
 * with the demo workspace, and `next start` on 127.0.0.1.
 */
export default async function setup(project: TestProject) {
  const distDir = process.env.NEXT_DIST_DIR || '.next-e2e';
  const env: NodeJS.ProcessEnv = { ...process.env, NEXT_DIST_DIR: distDir, NEXT_TELEMETRY_DISABLED: '1', NODE_ENV: 'production' };
  const built = fs.existsSync(path.join(root, distDir, 'BUILD_ID'));
  // the Monte Carlo worker is bundled on its own (about a second, so always): the app starts it from .haulcase/
  const w = spawnSync(path.join(root, 'node_modules/.bin/tsx'), ['scripts/build-workers.ts'], { cwd: root, env, stdio: 'inherit' });
  if (w.status !== 0) throw new Error('worker build failed');
  if (!(process.env.E2E_REUSE_BUILD === '1' && built)) {
    const b = spawnSync(path.join(root, 'node_modules/.bin/next'), ['build'], { cwd: root, env, stdio: 'inherit' });
    if (b.status !== 0) throw new Error('next build failed');
  }

  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-'));
  const dbEnv = { ...env, HAULCASE_DATA_DIR: dataDir };
  const k = createKnex(dbEnv);
  await k.migrate.latest();
  await seedDemo(k);
  await k.destroy();

  const port = await freePort();
  const baseURL = `http://127.0.0.1:${port}`;
  const server: ChildProcess = spawn(path.join(root, 'node_modules/.bin/next'), ['start', '-p', String(port), '-H', '127.0.0.1'], {
    cwd: root,
    env: { ...dbEnv, NEXTAUTH_URL: baseURL, NEXTAUTH_SECRET: 'e2e-secret-not-for-production', HAULCASE_E2E: '1' },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const log = fs.createWriteStream(path.join(dataDir, 'server.log'));
  server.stdout?.pipe(log);
  server.stderr?.pipe(log);
  await waitForServer(baseURL, server);

  project.provide('baseURL', baseURL);
  project.provide('e2eDataDir', dataDir);
  return async () => {
    server.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 300));
    if (process.env.E2E_KEEP_DATA !== '1') fs.rmSync(dataDir, { recursive: true, force: true });
  };
}

async function waitForServer(url: string, server: ChildProcess) {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    if (server.exitCode !== null) throw new Error(`next start exited with ${server.exitCode}`);
    try {
      const r = await fetch(`${url}/sign-in`);
      if (r.ok) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error('next start did not answer within 60 s');
}
