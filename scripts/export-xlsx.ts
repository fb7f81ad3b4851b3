/**
 * Export a case file as a workbook of live formulas:
 * `npm run --silent export:xlsx -- <case.json> <out.xlsx>`.
 * Exits 0 after writing; for an unreadable file, invalid JSON or an invalid
 * case, prints one `path: reason` line per problem on stderr and exits 2.
 */
import { writeFileSync } from 'node:fs';
import { writeCaseWorkbook } from '../lib/export/workbook';
import { evaluateOrExit, fail, readCaseFileOrExit, writeFileOrExit } from './cli-case';

async function main(): Promise<void> {
  const [file, out] = process.argv.slice(2);
  if (!file || !out) fail(['(arguments): usage: npm run --silent export:xlsx -- <path/to/case.json> <out.xlsx>']);
  const checked = readCaseFileOrExit(file);
  const buffer = await evaluateOrExit(() => writeCaseWorkbook(checked));
  writeFileOrExit(out, () => writeFileSync(out, buffer));
}

void main();
