import { diffAudit } from '@/lib/audit-diff';
import { fieldLabel } from '@/lib/audit-labels';

const Value = ({ v }: { v: string }) => (v === '' ? <span className="italic text-muted">(empty)</span> : <>{v}</>);

/**
 * The fields a change touched: old value struck through in loss red, new value
 * in gain green; a create lists what was set and a delete what was removed,
 * without book-keeping fields (ids, versions, time stamps).
 */
export function AuditDiff({ before, after, action }: { before: string | null; after: string | null; action?: string }) {
  const lines = diffAudit(before, after);
  if (lines.length === 0) {
    return <span className="text-muted">{action === 'update' || action === 'rename' || action === 'update-plan' || action === 'update-engine-lives' ? 'saved with no field changed' : 'no field values recorded'}</span>;
  }
  return (
    <table className="w-full text-xs" data-testid="audit-diff">
      <tbody>
        {lines.map((l) => (
          <tr key={l.field} className="align-top">
            <th scope="row" className="w-40 py-0.5 pr-2 text-left font-normal text-muted" title={l.field}>{fieldLabel(l.field)}</th>
            <td className="py-0.5 font-mono break-all">
              {l.before !== undefined ? <del className="text-loss"><Value v={l.before} /></del> : null}
              {l.before !== undefined && l.after !== undefined ? <span className="px-1 text-muted">→</span> : null}
              {l.after !== undefined ? <ins className="text-gain no-underline"><Value v={l.after} /></ins> : null}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
