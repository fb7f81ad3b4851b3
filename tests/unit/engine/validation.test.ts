/**
 * Bad input (MODEL.md section 9): every problem reported at once with its
 * JSON path; nothing computed from an invalid case; the CLI exits 2.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { CaseValidationError, evaluateCase, validateCase } from '@/lib/engine';
import { engineSchema, truckSchema } from '@/lib/validation/case';

const root = path.resolve(__dirname, '../../..');
const oneTruck = JSON.parse(readFileSync(path.join(root, 'scenarios/one-truck.json'), 'utf8'));
const clone = () => structuredClone(oneTruck);

function brokenCase() {
  const c = clone();
  c.assumptions.discountRate = -1.5; // outside (−0.99, 1]
  c.assumptions.taxRate = 1; // outside [0, 1)
  c.engines[0].lifeHours = 0; // non-positive life
  c.engines[1].weibullShape = -3; // non-positive Weibull shape
  c.engines[1].overhaulCost = -5; // negative cost
  c.engines.push({ ...c.engines[0] }); // duplicate id "old-2000"
  c.repowerOffers[0].engineId = 'ghost'; // unknown engine
  c.trucks.push({ ...c.trucks[0], id: 'T-02', annualHours: 0, engineId: 'nope', repowerOfferId: 'none' });
  delete c.trucks[0].loadFactor; // missing number
  c.trucks[0].extra = 1; // unknown field
  return c;
}

describe('validateCase', () => {
  it('accepts the demo scenarios', () => {
    for (const f of ['one-truck.json', 'aldervane-north-pit.json']) {
      const v = validateCase(JSON.parse(readFileSync(path.join(root, 'scenarios', f), 'utf8')));
      expect(v.ok).toBe(true);
    }
  });

  it('reports every problem of a case at once, each with its path', () => {
    const v = validateCase(brokenCase());
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const paths = v.problems.map((p) => p.path);
    expect(paths).toEqual(
      expect.arrayContaining([
        'assumptions.discountRate',
        'assumptions.taxRate',
        'engines[0].lifeHours',
        'engines[1].weibullShape',
        'engines[1].overhaulCost',
        'engines[2].id',
        'repowerOffers[0].engineId',
        'trucks[0].loadFactor',
        'trucks[0].extra',
        'trucks[1].annualHours',
        'trucks[1].engineId',
        'trucks[1].repowerOfferId',
      ]),
    );
    const byPath = Object.fromEntries(v.problems.map((p) => [p.path, p.message]));
    expect(byPath['trucks[0].loadFactor']).toBe('is required');
    expect(byPath['trucks[0].extra']).toBe('unknown field');
    expect(byPath['engines[2].id']).toMatch(/duplicate id "old-2000"/);
    expect(byPath['repowerOffers[0].engineId']).toMatch(/no engine has the id "ghost"/);
    expect(byPath['engines[1].overhaulCost']).toBe('must not be negative');
    expect(byPath['assumptions.discountRate']).toMatch(/greater than -0.99/);
  });

  it('refuses non-finite numbers and wrong types', () => {
    const c = clone();
    c.assumptions.fuelPrice = Number.NaN;
    c.assumptions.inflation = Number.POSITIVE_INFINITY;
    c.trucks[0].engineHours = '16500';
    const v = validateCase(c);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    const byPath = Object.fromEntries(v.problems.map((p) => [p.path, p.message]));
    expect(byPath['assumptions.fuelPrice']).toMatch(/finite number/);
    expect(byPath['assumptions.inflation']).toMatch(/finite number/);
    expect(byPath['trucks[0].engineHours']).toMatch(/finite number, not text/);
  });

  it('refuses a MACRS class the IRS does not print, and a core credit above the module and install', () => {
    const c = clone();
    c.assumptions.depreciation = { method: 'macrs', years: 4 };
    c.repowerOffers[0].coreCredit = 5_000_000;
    const v = validateCase(c);
    expect(v.ok).toBe(false);
    if (v.ok) return;
    expect(v.problems.map((p) => p.path)).toEqual(['assumptions.depreciation.years', 'repowerOffers[0].coreCredit']);
  });

  it('fills the documented defaults', () => {
    const c = clone();
    delete c.assumptions.timing;
    delete c.assumptions.rebuildAccounting;
    delete c.assumptions.horizonYears;
    delete c.repowerOffers[0].productivityGain;
    delete c.repowerOffers[0].timing;
    delete c.trucks[0].fuelBurnLitresPerHour;
    const v = validateCase(c);
    expect(v.ok).toBe(true);
    if (!v.ok) return;
    expect(v.value.assumptions.timing).toBe('end-of-year');
    expect(v.value.assumptions.rebuildAccounting).toBe('expense');
    expect(v.value.assumptions.horizonYears).toBeNull();
    expect(v.value.repowerOffers[0]).toMatchObject({ productivityGain: 0, timing: 'at-overhaul' });
    expect(v.value.trucks[0].fuelBurnLitresPerHour).toBeNull();
  });

  it('exports sub-schemas a form can reuse', () => {
    expect(engineSchema.safeParse(oneTruck.engines[0]).success).toBe(true);
    expect(truckSchema.safeParse({ ...oneTruck.trucks[0], annualHours: -1 }).success).toBe(false);
  });

  it('evaluateCase refuses an invalid case with every problem, computing nothing', () => {
    let caught: unknown;
    try {
      evaluateCase(brokenCase());
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(CaseValidationError);
    expect((caught as CaseValidationError).problems.length).toBeGreaterThanOrEqual(12);
  });
});

describe('CLI: npm run evaluate', () => {
  const tsx = path.join(root, 'node_modules/.bin/tsx');
  const run = (file: string) =>
    spawnSync(tsx, [path.join(root, 'scripts/evaluate.ts'), file], { cwd: root, encoding: 'utf8', timeout: 60_000 });

  it('prints case-result/1 JSON and exits 0 for a valid case', () => {
    const out = run(path.join(root, 'scenarios/one-truck.json'));
    expect(out.status).toBe(0);
    const parsed = JSON.parse(out.stdout);
    expect(parsed.format).toBe('case-result/1');
    expect(parsed.trucks[0].id).toBe('T-01');
  });

  it('exits 2 with one `path: reason` line per problem for an invalid case', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-cli-'));
    const file = path.join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify(brokenCase()));
    const out = run(file);
    expect(out.status).toBe(2);
    expect(out.stdout).toBe('');
    const lines = out.stderr.trim().split('\n');
    expect(lines.length).toBeGreaterThanOrEqual(12);
    for (const line of lines) expect(line).toMatch(/^[A-Za-z()[\].\d]+: .+/);
    expect(lines).toContain('trucks[1].annualHours: must be at least 1 hour');
  });

  // issue 12: the upload accepts a leading BOM, so both command-line tools do too (spawns two processes: a longer limit)
  const withBom = () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-cli-'));
    const file = path.join(dir, 'bom.json');
    writeFileSync(file, `\uFEFF${readFileSync(path.join(root, 'scenarios/one-truck.json'), 'utf8')}`);
    return { dir, file };
  };
  it('evaluate accepts a case file that starts with a UTF-8 BOM, as the upload does', () => {
    const out = run(withBom().file);
    expect(out.stderr).toBe('');
    expect(out.status).toBe(0);
    expect(JSON.parse(out.stdout).trucks[0].id).toBe('T-01');
  }, 60_000);
  it('export:xlsx accepts a case file that starts with a UTF-8 BOM', () => {
    const { dir, file } = withBom();
    const xlsx = path.join(dir, 'bom.xlsx');
    const exported = spawnSync(tsx, [path.join(root, 'scripts/export-xlsx.ts'), file, xlsx], { cwd: root, encoding: 'utf8', timeout: 60_000 });
    expect(exported.stderr).toBe('');
    expect(exported.status).toBe(0);
    // an xlsx is a zip archive: it starts with "PK"
    expect(readFileSync(xlsx).subarray(0, 2).toString('latin1')).toBe('PK');
  }, 60_000);

  it('exits 2 for a file that is not JSON or cannot be read', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-cli-'));
    const file = path.join(dir, 'garbage.json');
    writeFileSync(file, '{ not json');
    const bad = run(file);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/not valid JSON/);
    const missing = run(path.join(dir, 'missing.json'));
    expect(missing.status).toBe(2);
    expect(missing.stderr).toMatch(/cannot read/);
  }, 60_000); // two processes: on a loaded machine more than the default 5 s
});
