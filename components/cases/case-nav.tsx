import Link from 'next/link';

/** The sections of one case; the methodology link sits beside every result. */
export function CaseNav({ slug, caseId, current, truckId }: { slug: string; caseId: number; current: 'results' | 'plan' | 'truck' | 'risk' | 'actuals'; truckId?: string }) {
  const base = `/${slug}/cases/${caseId}`;
  const tab = (href: string, label: string, on: boolean) => (
    <Link href={href} aria-current={on ? 'page' : undefined} className={`rounded px-2 py-1 text-sm ${on ? 'bg-ink text-paper' : 'text-accent hover:underline'}`}>{label}</Link>
  );
  return (
    <nav aria-label="Case" className="mb-4 flex flex-wrap items-center gap-2 print:hidden">
      <Link href={`/${slug}/cases`} className="text-sm text-muted hover:underline">← All cases</Link>
      <span className="text-rule">|</span>
      {tab(base, 'Results', current === 'results')}
      {tab(`${base}/plan`, 'Fleet programme and ranking', current === 'plan')}
      {/* from a truck page, the risk page opens on that truck */}
      {tab(`${base}/risk${truckId ? `?truck=${encodeURIComponent(truckId)}` : ''}`, truckId ? `Sensitivity and risk of ${truckId}` : 'Sensitivity and risk', current === 'risk')}
      {current === 'actuals' ? tab(`${base}/actuals`, 'Plan against actual', true) : null}
      <Link href={`/${slug}/methodology`} className="ml-auto text-sm text-accent underline">Methodology: how these figures are computed</Link>
    </nav>
  );
}
