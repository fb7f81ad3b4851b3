/**
 * What the command-line tools share: reading a case file and refusing a bad
 * one with one `path: reason` line per problem on stderr and exit code 2.
 */
import { readFileSync } from 'node:fs';
import { EventLimitError } from '../lib/engine/limits';
import { validateCase, type CaseFile } from '../lib/validation/case';

export function fail(lines: string[]): never {
  process.stderr.write(lines.map((l) => `${l}\n`).join(''));
  process.exit(2);
}

const reason = (err: unknown) => (err as NodeJS.ErrnoException).code ?? (err as Error).message;

/**
 * The text of a JSON file without a leading UTF-8 byte-order mark (U+FEFF),
 * which some editors write and JSON.parse refuses; the upload route accepts
 * one too (a request body's JSON is decoded without it).
 */
export function stripUtf8Bom(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** The validated case in `file`, or exit 2 saying what is wrong and where. */
export function readCaseFileOrExit(file: string): CaseFile {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    fail([`${file}: cannot read the file (${reason(err)})`]);
  }
  let input: unknown;
  try {
    input = JSON.parse(stripUtf8Bom(text));
  } catch (err) {
    fail([`${file}: not valid JSON (${(err as Error).message})`]);
  }
  const checked = validateCase(input);
  if (!checked.ok) fail(checked.problems.map((p) => `${p.path}: ${p.message}`));
  return checked.value;
}

export function writeFileOrExit(out: string, write: () => void): void {
  try {
    write();
  } catch (err) {
    fail([`${out}: cannot write the file (${reason(err)})`]);
  }
}

/**
 * The engine's answer, or exit 2 with its message when it refuses the case
 * (a run that would book more events than the engine's cap, see lib/engine/limits.ts).
 */
export async function evaluateOrExit<T>(evaluate: () => T | Promise<T>): Promise<T> {
  try {
    return await evaluate();
  } catch (err) {
    if (err instanceof EventLimitError) fail([`trucks (truck ${err.truckId}): ${err.message}`]);
    throw err;
  }
}
