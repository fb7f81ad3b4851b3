/** "Download decision pack (PDF)": the server-made PDF of the proposal (a plain link: the browser saves the file). */
export function DecisionPackLink({ slug, caseId, primary = false }: { slug: string; caseId: number; primary?: boolean }) {
  return (
    <a className={`btn${primary ? ' btn-primary' : ''}`} href={`/api/workspaces/${encodeURIComponent(slug)}/cases/${caseId}/decision-pack`} download data-testid="decision-pack-link">
      Download decision pack (PDF)
    </a>
  );
}
