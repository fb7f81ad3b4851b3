import { formatNumber } from '@/lib/format';

type Row = { truckId: number; unitNumber: string; engineHours: number | null; annualHours: number | null; fuelBurnLitresPerHour: number | null; engineKey: string | null };

/**
 * The figures a case holds for its trucks in place of the register's (a
 * re-forecast case: from the trucks' readings). Shown on the case page so a
 * planner sees which figures the case uses; nothing when it has none.
 */
export function OwnTruckFigures({ rows }: { rows: Row[] }) {
  if (rows.length === 0) return null;
  return (
    <details className="card mb-4 p-4 text-sm" data-testid="own-truck-figures" open>
      <summary className="cursor-pointer font-semibold">This case&rsquo;s own truck figures ({rows.length} trucks)</summary>
      <p className="mt-1 max-w-3xl text-muted">
        Re-forecast from readings: the case evaluates these figures, not the register&rsquo;s, for these trucks (their other figures, offers and engines&rsquo;
        data come from the register as usual). A later change to the register&rsquo;s engine hours, annual hours, fuel burn or engine type does not reach them.
      </p>
      <div className="mt-2 max-h-96 overflow-auto">
        <table className="data-table">
          <thead>
            <tr><th>Unit</th><th className="n">Engine hours (h)</th><th className="n">Annual hours (h)</th><th className="n">Fuel burn (L/h)</th><th>Engine type</th></tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.truckId} data-testid={`own-figures-${r.unitNumber}`}>
                <td className="font-mono text-xs">{r.unitNumber}</td>
                <td className="n" data-testid="engine-hours">{r.engineHours === null ? '—' : formatNumber(r.engineHours)}</td>
                <td className="n" data-testid="annual-hours">{r.annualHours === null ? '—' : formatNumber(r.annualHours)}</td>
                <td className="n">{r.fuelBurnLitresPerHour === null ? 'engine model' : formatNumber(r.fuelBurnLitresPerHour, 1)}</td>
                <td className="font-mono text-xs">{r.engineKey ?? '—'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </details>
  );
}
