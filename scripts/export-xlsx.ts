/**
 * Export a case file as a workbook of live formulas:
 * `npm run --silent export:xlsx -- <case.json> <out.xlsx>`.
 * Exits 0 after writing; for an unreadable file, invalid JSON or an invalid
 * case, prints one `path: reason` line per problem on stderr and exits 2.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { writeCaseWorkbook } from '../lib/export/workbook';
import { validateCase } from '../lib/validation/case';

function fail(lines: string[]): never {
  process.stderr.write(lines.map((l) => `${l}\n`).join(''));
  process.exit(2);
}

async function main(): Promise<void> {
  const [file, out] = process.argv.slice(2);
  if (!file || !out) fail(['(arguments): usage: npm run --silent export:xlsx -- <path/to/case.json> <out.xlsx>']);
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
  const buffer = await writeCaseWorkbook(checked.value);
  try {
    writeFileSync(out, buffer);
  } catch (err) {
    fail([`${out}: cannot write the file (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`]);
  }
}

void main();
