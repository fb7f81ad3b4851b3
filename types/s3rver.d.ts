// The part of s3rver (the local S3 fake the tests start) that the tests use.
declare module 's3rver' {
  export default class S3rver {
    constructor(options: { port?: number; address?: string; silent?: boolean; directory: string; configureBuckets?: { name: string }[] });
    run(): Promise<{ address: string; family: string; port: number }>;
    close(): Promise<void>;
  }
}
