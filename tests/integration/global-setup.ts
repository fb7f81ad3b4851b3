import type { TestProject } from 'vitest/node';
import { startPostgres } from '../support/postgres';
import { startS3Fake } from '../support/s3';

declare module 'vitest' {
  export interface ProvidedContext {
    pgUrl: string;
    /** The S3 fake's variables (S3_BUCKET, AWS_ENDPOINT_URL, AWS_REGION, keys). */
    s3Env: Record<string, string>;
  }
}

/** One PostgreSQL server and one S3 fake (s3rver) on loopback for the whole integration run. */
export default async function setup(project: TestProject) {
  const pg = await startPostgres();
  const s3 = await startS3Fake();
  project.provide('pgUrl', pg.url);
  project.provide('s3Env', s3.env);
  return async () => {
    await s3.stop();
    await pg.stop();
  };
}
