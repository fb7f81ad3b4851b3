import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3';
import { freePort } from './ports';

export type S3Fake = {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** The variables a server (or the app's code in a test) needs to keep quote documents in this bucket. */
  env: Record<string, string>;
  stop: () => Promise<void>;
};

/**
 * The local S3 fake (npm `s3rver`) on a free loopback port, with its objects in
 * a temporary folder and one empty bucket. s3rver accepts the keys S3RVER/S3RVER.
 */
export async function startS3Fake(bucket = 'haulcase-test'): Promise<S3Fake> {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-s3-'));
  const port = await freePort();
  const server = new S3rver({ port, address: '127.0.0.1', silent: true, directory });
  await server.run();
  const endpoint = `http://127.0.0.1:${port}`;
  const region = 'us-east-1';
  const creds = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };
  const admin = new S3Client({ endpoint, region, forcePathStyle: true, credentials: creds });
  await admin.send(new CreateBucketCommand({ Bucket: bucket }));
  admin.destroy();
  return {
    endpoint,
    bucket,
    region,
    ...creds,
    env: { S3_BUCKET: bucket, AWS_ENDPOINT_URL: endpoint, AWS_REGION: region, AWS_ACCESS_KEY_ID: creds.accessKeyId, AWS_SECRET_ACCESS_KEY: creds.secretAccessKey },
    stop: async () => {
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}
