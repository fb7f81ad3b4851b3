/**
 * What the command-line tools share: reading a case file and refusing a bad
 * one with one `path: reason` line per problem on stderr and exit code 2.
 */
import { readFileSync } from 'node:fs';
import { validateCase, type CaseFile } from '../lib/validation/case';

export function fail(lines: string[]): never {
  process.stderr.write(lines.map((l) => `${l}\n`).join(''));
  process.exit(2);
}

const reason = (err: unknown) => (err as NodeJS.ErrnoException).code ?? (err as Error).message;

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
    input = JSON.parse(text);
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
