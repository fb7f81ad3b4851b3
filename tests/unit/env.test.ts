import { describe, expect, it } from 'vitest';
import { EnvError, parseEnv } from '@/lib/env';

/** The problems parseEnv reports for `raw`, as "VARIABLE message" lines. */
function problems(raw: Record<string, string>): string[] {
  try {
    parseEnv(raw);
  } catch (e) {
    expect(e).toBeInstanceOf(EnvError);
    return (e as EnvError).problems.map((p) => `${p.variable} ${p.message}`);
  }
  return [];
}

const PG = { DATABASE_URL: 'postgres://haulcase:pw@127.0.0.1:5432/haulcase', NEXTAUTH_SECRET: 'a-secret-of-enough-length' };
const S3 = { S3_BUCKET: 'haulcase-quotes', AWS_REGION: 'us-east-1', AWS_ENDPOINT_URL: 'http://127.0.0.1:9000', AWS_ACCESS_KEY_ID: 'key', AWS_SECRET_ACCESS_KEY: 'secret' };

describe('the environment schema', () => {
  it('needs nothing for the demo (SQLite, local disk, mail sink) and gives the documented defaults', () => {
    const e = parseEnv({});
    expect(e.HAULCASE_MC_MAX_RUNNING).toBe(2);
    expect(e.HAULCASE_MC_WORKERS).toBe(2);
    expect(e.HAULCASE_MC_TIME_LIMIT_MS).toBe(120_000);
    expect(e.HAULCASE_MC_QUEUE_EXPIRE_S).toBe(150);
    expect(e.HAULCASE_MC_QUEUE_RETRIES).toBe(1);
    expect(e.DATABASE_URL).toBeUndefined();
    expect(e.S3_BUCKET).toBeUndefined();
  });

  it('treats an empty variable as not set', () => {
    expect(parseEnv({ HAULCASE_MC_MAX_RUNNING: '', DATABASE_URL: ' ', S3_BUCKET: '' }).HAULCASE_MC_MAX_RUNNING).toBe(2);
  });

  it('accepts a full PostgreSQL + S3 + SMTP configuration and reads its numbers', () => {
    const e = parseEnv({ ...PG, ...S3, HAULCASE_MC_MAX_RUNNING: '4', HAULCASE_MC_WORKERS: '8', HAULCASE_MC_TIME_LIMIT_MS: '60000', SMTP_HOST: 'smtp.example.com', SMTP_PORT: '2525', SMTP_USER: 'u', SMTP_PASS: 'p' });
    expect([e.HAULCASE_MC_MAX_RUNNING, e.HAULCASE_MC_WORKERS, e.HAULCASE_MC_TIME_LIMIT_MS, e.SMTP_PORT]).toEqual([4, 8, 60_000, 2525]);
  });

  it.each([
    ['HAULCASE_MC_MAX_RUNNING', 'abc', /must be a whole number of runs from 1 to 64/],
    ['HAULCASE_MC_MAX_RUNNING', '0', /must be from 1 to 64 runs/],
    ['HAULCASE_MC_MAX_RUNNING', '2.5', /whole number/],
    ['HAULCASE_MC_WORKERS', '-1', /whole number of worker threads/],
    ['HAULCASE_MC_WORKERS', '65', /from 1 to 64 worker threads/],
    ['HAULCASE_MC_TIME_LIMIT_MS', '2m', /whole number of milliseconds from 100 to 3,600,000/],
    ['HAULCASE_MC_TIME_LIMIT_MS', '99', /from 100 to 3,600,000 milliseconds/],
    ['HAULCASE_MC_RECYCLE_MS', '-5', /whole number of milliseconds \(0 = never\)/],
    ['HAULCASE_BREAK_EVEN_TIME_LIMIT_MS', '50', /from 100 to 3,600,000 milliseconds/],
    ['HAULCASE_EXPORT_TIME_LIMIT_MS', '99', /from 100 to 3,600,000 milliseconds/],
    ['HAULCASE_EXPORT_IDLE_MS', '-1', /whole number of milliseconds/],
    ['HAULCASE_MC_PREWARM', 'no', /must be 0 or 1/],
    ['HAULCASE_TRUSTED_PROXY', 'true', /must be 0 or 1/],
    ['DATABASE_URL', 'mysql://db/haulcase', /must be a PostgreSQL URL/],
    ['DATABASE_URL', 'not a url', /must be a PostgreSQL URL/],
    ['NEXTAUTH_URL', 'haulcase.example.com', /must be an http\(s\) URL/],
    ['APP_URL', 'ftp://haulcase.example.com', /must be an http\(s\) URL/],
    ['SMTP_PORT', '70000', /port number from 1 to 65535/],
    ['SMTP_PORT', 'smtp', /port number/],
    ['S3_BUCKET', 'Quotes_Bucket', /S3 bucket name/],
    ['AWS_ENDPOINT_URL', '127.0.0.1:9000', /http\(s\) URL/],
    ['NEXTAUTH_SECRET', 'short', /at least 16 characters/],
    ['HAULCASE_MAIL_SINK', '1', /no longer read/],
    ['HAULCASE_MC_QUEUE_EXPIRE_S', '1', /from 2 to 3,600 seconds/],
    ['HAULCASE_MC_QUEUE_EXPIRE_S', '90s', /whole number of seconds from 2 to 3,600/],
    ['HAULCASE_MC_QUEUE_EXPIRE_S', '3601', /from 2 to 3,600 seconds/],
    ['HAULCASE_MC_QUEUE_RETRIES', '6', /from 0 to 5 retries/],
    ['HAULCASE_MC_QUEUE_RETRIES', 'once', /whole number of retries from 0 to 5/],
  ])('refuses %s=%s, naming it', (variable, value, message) => {
    // with what the variable needs beside it, so that it is the only problem
    const companions: Record<string, Record<string, string>> = { DATABASE_URL: { NEXTAUTH_SECRET: PG.NEXTAUTH_SECRET }, S3_BUCKET: { AWS_REGION: 'us-east-1' } };
    const found = problems({ ...companions[variable], [variable]: value });
    expect(found).toHaveLength(1);
    expect(found[0].startsWith(`${variable} `)).toBe(true);
    expect(found[0]).toMatch(message);
  });

  it('requires NEXTAUTH_SECRET whenever the database is PostgreSQL', () => {
    expect(problems({ DATABASE_URL: PG.DATABASE_URL })).toEqual([expect.stringMatching(/^NEXTAUTH_SECRET is required with PostgreSQL/)]);
    expect(problems(PG)).toEqual([]);
    expect(problems({})).toEqual([]); // SQLite: the demo keeps a generated secret in its data folder
  });

  it('with PostgreSQL, refuses a queue expiry no longer than a run may take (a live server would lose its runs)', () => {
    expect(problems({ ...PG, HAULCASE_MC_QUEUE_EXPIRE_S: '120' })).toEqual([expect.stringMatching(/^HAULCASE_MC_QUEUE_EXPIRE_S must be longer than a run may take \(HAULCASE_MC_TIME_LIMIT_MS is 120,000 ms\)/)]);
    expect(problems({ ...PG, HAULCASE_MC_QUEUE_EXPIRE_S: '121' })).toEqual([]);
    expect(problems({ ...PG, HAULCASE_MC_QUEUE_EXPIRE_S: '5', HAULCASE_MC_TIME_LIMIT_MS: '4000' })).toEqual([]);
    expect(parseEnv({ ...PG, HAULCASE_MC_QUEUE_EXPIRE_S: '5', HAULCASE_MC_TIME_LIMIT_MS: '4000' }).HAULCASE_MC_QUEUE_EXPIRE_S).toBe(5);
    // SQLite has no queue: the expiry is not read
    expect(problems({ HAULCASE_MC_QUEUE_EXPIRE_S: '60' })).toEqual([]);
  });

  it.each([
    [{ S3_BUCKET: 'haulcase-quotes' }, 'AWS_REGION'],
    [{ ...S3, AWS_SECRET_ACCESS_KEY: '' }, 'AWS_SECRET_ACCESS_KEY'],
    [{ ...S3, AWS_ACCESS_KEY_ID: '' }, 'AWS_ACCESS_KEY_ID'],
    [{ ...S3, HAULCASE_UPLOAD_DIR: '/srv/uploads' }, 'HAULCASE_UPLOAD_DIR'],
    [{ S3_ENDPOINT: 'http://127.0.0.1:9000' }, 'S3_ENDPOINT'],
    [{ S3_FORCE_PATH_STYLE: '1' }, 'S3_FORCE_PATH_STYLE'],
    [{ SMTP_HOST: 'smtp.example.com', SMTP_USER: 'u' }, 'SMTP_PASS'],
    [{ SMTP_HOST: 'smtp.example.com', SMTP_PASS: 'p' }, 'SMTP_USER'],
  ])('refuses a partial configuration %o, naming %s', (raw, variable) => {
    const found = problems(raw as Record<string, string>);
    expect(found).toHaveLength(1);
    expect(found[0].startsWith(`${variable} `)).toBe(true);
  });

  it('lists every bad variable at once in one start-up message', () => {
    try {
      parseEnv({ HAULCASE_MC_MAX_RUNNING: 'x', HAULCASE_MC_WORKERS: 'y' });
      expect.unreachable();
    } catch (e) {
      expect((e as Error).message).toMatch(/^Haulcase cannot start: 2 settings are wrong in the environment:\n {2}HAULCASE_MC_MAX_RUNNING must be .*\n {2}HAULCASE_MC_WORKERS must be /);
    }
  });
});
