import 'server-only';
import { env } from '@/lib/env';
import { localDiskStorage, uploadRoot } from './local-disk';
import { s3ConfigFromEnv, s3Storage } from './s3';
import type { Storage } from './types';

export type { Storage, StoredObject } from './types';
export { checkKey } from './types';
export { localDiskStorage, uploadRoot } from './local-disk';
export { s3Storage, s3ConfigFromEnv, type S3Config } from './s3';

/**
 * Where quote documents live: an S3 bucket when `S3_BUCKET` is set (with
 * `AWS_REGION`, the endpoint in `AWS_ENDPOINT_URL` or `S3_ENDPOINT` for an
 * S3-compatible service, credentials in `AWS_ACCESS_KEY_ID` /
 * `AWS_SECRET_ACCESS_KEY` or the SDK's usual chain), else the local disk
 * (`HAULCASE_UPLOAD_DIR`, default `uploads/` in the data folder). Read at each
 * call (from the validated environment) so tests can point it elsewhere.
 */
export function getStorage(): Storage {
  const e = env();
  if (e.S3_BUCKET) return s3Storage(s3ConfigFromEnv(e));
  return localDiskStorage(uploadRoot());
}
