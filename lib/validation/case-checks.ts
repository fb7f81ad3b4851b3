/**
 * Turning zod issues and cross-field checks of a case into plain problems:
 * a JSON path such as `trucks[3].annualHours` and a reason in words.
 */
import type { z } from 'zod';

export interface CaseProblem {
  /** JSON path such as `trucks[3].annualHours`; `(root)` for the whole case. */
  path: string;
  message: string;
}

/** `['trucks', 3, 'annualHours']` → `trucks[3].annualHours`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out === '' ? '(root)' : out;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = root;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[key];
  }
  return v;
}

function describe(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
  if (typeof v === 'string') return 'text';
  return typeof v === 'object' ? 'an object' : typeof v;
}

const EXPECTED_WORDS: Record<string, string> = {
  number: 'a finite number',
  int: 'a whole number',
  string: 'text',
  object: 'an object',
  array: 'a list',
  boolean: 'true or false',
};

export function plainProblems(input: unknown, issue: z.core.$ZodIssue): CaseProblem[] {
  const path = issue.path as PropertyKey[];
  switch (issue.code) {
    case 'unrecognized_keys':
      return issue.keys.map((k) => ({ path: formatPath([...path, k]), message: 'unknown field' }));
    case 'invalid_type': {
      const got = valueAt(input, path);
      if (got === undefined) return [{ path: formatPath(path), message: 'is required' }];
      const want = EXPECTED_WORDS[issue.expected] ?? issue.expected;
      return [{ path: formatPath(path), message: `must be ${want}, not ${describe(got)}` }];
    }
    case 'invalid_value':
      if (issue.message.startsWith('must')) return [{ path: formatPath(path), message: issue.message }];
      return [
        {
          path: formatPath(path),
          message: `must be one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`,
        },
      ];
    case 'invalid_union': {
      const options = (issue as { options?: unknown[] }).options;
      if (options) {
        const got = valueAt(input, path);
        if (got === undefined) return [{ path: formatPath(path), message: 'is required' }];
        return [{ path: formatPath(path), message: `must be one of ${options.map((o) => JSON.stringify(o)).join(', ')}` }];
      }
      return [{ path: formatPath(path), message: issue.message }];
    }
    default:
      return [{ path: formatPath(path), message: issue.message }];
  }
}

function asArray(v: unknown): unknown[] {
  return Array.isArray(v) ? v : [];
}
function idOf(v: unknown): string | undefined {
  if (v && typeof v === 'object' && typeof (v as { id?: unknown }).id === 'string') return (v as { id: string }).id;
  return undefined;
}
function fieldOf(v: unknown, key: string): unknown {
  return v && typeof v === 'object' ? (v as Record<string, unknown>)[key] : undefined;
}

/**
 * Checks that need more than one field: duplicate ids, references to ids that
 * do not exist, and a core credit larger than the module and its install.
 * Works on the raw input so these problems are reported alongside the schema's.
 */
export function crossFieldProblems(input: unknown, maxHorizonYears: number): CaseProblem[] {
  const problems: CaseProblem[] = [];
  const engines = asArray(fieldOf(input, 'engines'));
  const offers = asArray(fieldOf(input, 'repowerOffers'));
  const trucks = asArray(fieldOf(input, 'trucks'));

  const collectIds = (list: unknown[], name: string): Set<string> => {
    const seen = new Map<string, number>();
    list.forEach((item, i) => {
      const id = idOf(item);
      if (id === undefined) return;
      const first = seen.get(id);
      if (first !== undefined) {
        problems.push({ path: `${name}[${i}].id`, message: `duplicate id "${id}" (already used by ${name}[${first}])` });
      } else seen.set(id, i);
    });
    return new Set(seen.keys());
  };
  const engineIds = collectIds(engines, 'engines');
  const offerIds = collectIds(offers, 'repowerOffers');
  collectIds(trucks, 'trucks');

  offers.forEach((offer, i) => {
    const ref = fieldOf(offer, 'engineId');
    if (typeof ref === 'string' && ref !== '' && !engineIds.has(ref)) {
      problems.push({ path: `repowerOffers[${i}].engineId`, message: `no engine has the id "${ref}"` });
    }
    const price = fieldOf(offer, 'modulePrice');
    const install = fieldOf(offer, 'installCost');
    for (const key of ['coreCredit', 'failedCoreCredit'] as const) {
      const core = fieldOf(offer, key);
      if ([price, install, core].every((n) => typeof n === 'number' && Number.isFinite(n))) {
        if ((core as number) > (price as number) + (install as number)) {
          problems.push({
            path: `repowerOffers[${i}].${key}`,
            message: 'must not exceed modulePrice + installCost (the capital cost would be negative)',
          });
        }
      }
    }
  });
  // declining balance: D_1 = B·factor/n must not exceed the basis, so factor ≤ n
  const dep = fieldOf(fieldOf(input, 'assumptions'), 'depreciation');
  const factor = fieldOf(dep, 'factor');
  const depYears = fieldOf(dep, 'years');
  if (fieldOf(dep, 'method') === 'declining-balance' && typeof depYears === 'number' && depYears >= 1) {
    const f = factor === undefined ? 2 : factor;
    if (typeof f === 'number' && f > depYears) {
      problems.push({
        path: 'assumptions.depreciation.factor',
        message: `must be at most the ${depYears} depreciation years (factor ${f} would write off more than the spend in the first year)${factor === undefined ? '; it defaults to 2' : ''}`,
      });
    }
  }
  const cap = fieldOf(fieldOf(input, 'assumptions'), 'horizonYears');
  trucks.forEach((truck, i) => {
    const life = fieldOf(truck, 'remainingLifeHours');
    const annual = fieldOf(truck, 'annualHours');
    if (cap == null && typeof life === 'number' && typeof annual === 'number' && life > 0 && annual > 0) {
      // N = ceil(life / annual) (rounding as setup.horizonYears does): refused above the cap,
      // also when annual hours are tiny and N would be millions of years
      const years = life / annual;
      if (!(years <= maxHorizonYears)) {
        const shown = Number.isFinite(years) ? Math.ceil(years).toLocaleString('en-US') : 'too many';
        problems.push({
          path: `trucks[${i}].remainingLifeHours`,
          message: `gives ${shown} years at ${annual} hours a year, more than the ${maxHorizonYears} years allowed; lower it, raise annualHours or set assumptions.horizonYears`,
        });
      }
    }
    const eng = fieldOf(truck, 'engineId');
    if (typeof eng === 'string' && eng !== '' && !engineIds.has(eng)) {
      problems.push({ path: `trucks[${i}].engineId`, message: `no engine has the id "${eng}"` });
    }
    const off = fieldOf(truck, 'repowerOfferId');
    if (typeof off === 'string' && off !== '' && !offerIds.has(off)) {
      problems.push({ path: `trucks[${i}].repowerOfferId`, message: `no repower offer has the id "${off}"` });
    }
  });
  return problems;
}

function pathOrder(p: string): (string | number)[] {
  return p.split(/[.[\]]+/).filter(Boolean).map((s) => (/^\d+$/.test(s) ? Number(s) : s));
}

/** One line per path and reason, in document order (sections, then item index). */
export function orderProblems(problems: readonly CaseProblem[]): CaseProblem[] {
  const seen = new Set<string>();
  const unique = problems.filter((p) => {
    const key = `${p.path}\u0000${p.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  const order = ['format', 'name', 'currency', 'assumptions', 'engines', 'repowerOffers', 'trucks'];
  return unique.sort((a, b) => {
    const pa = pathOrder(a.path);
    const pb = pathOrder(b.path);
    const ra = order.indexOf(String(pa[0]));
    const rb = order.indexOf(String(pb[0]));
    if (ra !== rb) return (ra < 0 ? 99 : ra) - (rb < 0 ? 99 : rb);
    const ia = typeof pa[1] === 'number' ? pa[1] : -1;
    const ib = typeof pb[1] === 'number' ? pb[1] : -1;
    return ia - ib;
  });
}
