'use client';
import { fromInput, toInput } from './format';
import type { DriverView, MonteCarloRequest } from './types';

export type DistributionDraft = MonteCarloRequest['distributions'][number]['distribution'];

/** A sensible starting distribution around the driver's value in the case. */
export function defaultDistribution(kind: DistributionDraft['kind'], base: number): DistributionDraft {
  const lo = base * 0.8;
  const hi = base * 1.2;
  switch (kind) {
    case 'fixed':
      return { kind };
    case 'uniform':
      return { kind, min: lo, max: hi };
    case 'triangular':
      return { kind, min: lo, mode: base, max: hi };
    case 'normal':
      return { kind, mean: base, sd: base * 0.1, min: base * 0.7, max: base * 1.3 };
  }
}

const FIELDS: Record<DistributionDraft['kind'], string[]> = {
  fixed: [],
  uniform: ['min', 'max'],
  triangular: ['min', 'mode', 'max'],
  normal: ['mean', 'sd', 'min', 'max'],
};

/** One row per driver: its distribution and the parameters in the driver's unit. */
export function DistributionRows({ drivers, value, onChange, problems }: {
  drivers: DriverView[];
  value: Record<string, DistributionDraft>;
  onChange: (id: string, d: DistributionDraft) => void;
  problems: Map<string, string>;
}) {
  return (
    <table className="data-table" data-testid="mc-distributions">
      <thead>
        <tr>
          <th>Driver</th>
          <th>In the case</th>
          <th>Distribution</th>
          <th>Parameters (driver&rsquo;s unit)</th>
        </tr>
      </thead>
      <tbody>
        {drivers.map((d) => {
          const dist = value[d.id] ?? { kind: 'fixed' };
          const problem = problems.get(d.id);
          return (
            <tr key={d.id} data-driver={d.id}>
              <td>{d.label} <span className="text-xs text-muted">{d.unit}</span></td>
              <td className="n">{toInput(d, d.base).toLocaleString('en-US')}</td>
              <td>
                <select className="field w-32 py-0.5" aria-label={`Distribution of ${d.label}`} value={dist.kind} onChange={(e) => onChange(d.id, defaultDistribution(e.target.value as DistributionDraft['kind'], d.base))}>
                  <option value="fixed">fixed</option>
                  <option value="uniform">uniform</option>
                  <option value="triangular">triangular</option>
                  <option value="normal">normal (truncated)</option>
                </select>
              </td>
              <td>
                <div className="flex flex-wrap items-center gap-2">
                  {FIELDS[dist.kind].map((f) => {
                    const raw = (dist as unknown as Record<string, number>)[f];
                    return (
                      <label key={`${dist.kind}-${f}`} className="flex items-center gap-1 text-xs text-muted">
                        {f}
                        <input
                          type="number"
                          step="any"
                          className="field w-24 py-0.5 text-right"
                          aria-label={`${f} of ${d.label}`}
                          aria-invalid={problem ? true : undefined}
                          defaultValue={f === 'sd' && d.unit.includes('%') ? raw * 100 : toInput(d, raw)}
                          onChange={(e) => {
                            const n = Number(e.target.value);
                            if (e.target.value.trim() === '' || !Number.isFinite(n)) return;
                            onChange(d.id, { ...dist, [f]: fromInput(d, n) } as DistributionDraft);
                          }}
                        />
                      </label>
                    );
                  })}
                  {problem ? <span role="alert" className="text-xs text-loss">{problem}</span> : null}
                </div>
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
