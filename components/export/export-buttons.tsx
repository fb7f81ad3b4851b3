/** Downloads of a case: the workbook of live formulas and the Summary CSV (plain links: the browser saves the file). */
export function ExportButtons({ slug, caseId }: { slug: string; caseId: number }) {
  const base = `/api/workspaces/${encodeURIComponent(slug)}/cases/${caseId}/export`;
  return (
    <>
      <a className="btn" href={`${base}?format=csv`} download>
        Summary CSV
      </a>
      <a className="btn btn-primary" href={`${base}?format=xlsx`} download>
        Download workbook (XLSX)
      </a>
    </>
  );
}
