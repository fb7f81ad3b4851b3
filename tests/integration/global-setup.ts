import type { TestProject } from 'vitest/node';
import { startPostgres } from '../support/postgres';

declare module 'vitest' {
  export interface ProvidedContext {
    pgUrl: string;
  }
}

/** One PostgreSQL server on loopback for the whole integration run. */
export default async function setup(project: TestProject) {
  const pg = await startPostgres();
  project.provide('pgUrl', pg.url);
  return () => pg.stop();
}
