/**
 * Evaluate a case file: `npm run --silent evaluate -- <case.json>`.
 * Prints the case-result/1 JSON on stdout and exits 0; for an unreadable
 * file, invalid JSON or an invalid case, prints one `path: reason` line per
 * problem on stderr and exits 2.
 */
import { readFileSync } from 'node:fs';
import { evaluateCase } from '../lib/engine/evaluate';
import { validateCase } from '../lib/validation/case';

function fail(lines: string[]): never {
  process.stderr.write(lines.map((l) => `${l}\n`).join(''));
  process.exit(2);
}

const file = process.argv[2];
if (!file) fail(['(arguments): usage: npm run --silent evaluate -- <path/to/case.json>']);

let text: string;
try {
  text = readFileSync(file, 'utf8');
} catch (err) {
  fail([`${file}: cannot read the file (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`]);
}

let input: unknown;
try {
  input = JSON.parse(text);
} catch (err) {
  fail([`${file}: not valid JSON (${(err as Error).message})`]);
}

const checked = validateCase(input);
if (!checked.ok) fail(checked.problems.map((p) => `${p.path}: ${p.message}`));

// A reader that closes early (`| head`) is not an error of ours.
process.stdout.on('error', (err: NodeJS.ErrnoException) => process.exit(err.code === 'EPIPE' ? 0 : 1));

const result = evaluateCase(checked.value, { trusted: true });
process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
