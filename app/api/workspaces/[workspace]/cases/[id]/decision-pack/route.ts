import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { buildDecisionPackData, loadPackFonts } from '@/lib/decision-pack/build';
import { packDisposition } from '@/lib/decision-pack/layout';
import { renderDecisionPack } from '@/lib/decision-pack/render';
import { idParams, readParams, route } from '@/lib/http';

/**
 * GET: the decision pack, a PDF of the case's proposal (summary, fleet chart,
 * ranking, schedule, risk, assumptions, approval trail, caution). Any member
 * may download it. The work is bounded: the case is evaluated once (a case
 * lists at most 10,000 trucks) and the ranking and schedule print at most
 * MAX_TABLE_ROWS rows each.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const data = await buildDecisionPackData(access, readParams(idParams, p).id);
  const pdf = await renderDecisionPack(data, await loadPackFonts());
  return new Response(new Uint8Array(pdf), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': packDisposition(data.summary.caseName),
      'cache-control': 'no-store',
    },
  });
});
