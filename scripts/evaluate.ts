/**
 * Evaluate a case file: `npm run --silent evaluate -- <case.json>`.
 * Prints the case-result/1 JSON on stdout and exits 0 (a leading UTF-8 BOM is
 * accepted); for an unreadable
 * file, invalid JSON, an invalid case or one the engine refuses, prints one `path: reason` line per
 * problem on stderr and exits 2.
 */
import { evaluateCase } from '../lib/engine/evaluate';
import { evaluateOrExit, fail, readCaseFileOrExit } from './cli-case';

const file = process.argv[2];
if (!file) fail(['(arguments): usage: npm run --silent evaluate -- <path/to/case.json>']);
const checked = readCaseFileOrExit(file);

// A reader that closes early (`| head`) is not an error of ours.
process.stdout.on('error', (err: NodeJS.ErrnoException) => process.exit(err.code === 'EPIPE' ? 0 : 1));

void evaluateOrExit(() => evaluateCase(checked, { trusted: true })).then((result) => {
  process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
});
