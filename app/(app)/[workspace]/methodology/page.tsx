import fs from 'node:fs/promises';
import path from 'node:path';
import type { Metadata } from 'next';
import { PlanningMethodology } from '@/components/cases/methodology-content';
import { Markdown } from '@/components/ui/markdown';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Methodology' };

// The engine's methodology lives in one file, docs/methodology.md, so the page, the repository and the engine agree.
async function readEngineMethodology(): Promise<string> {
  return fs.readFile(path.join(process.cwd(), 'docs', 'methodology.md'), 'utf8');
}

export default async function MethodologyPage({ params }: { params: Promise<{ workspace: string }> }) {
  await getPageAccess((await params).workspace);
  const source = await readEngineMethodology();
  return (
    <>
      <PageHeader title="Methodology" subtitle="How every figure in a business case is computed, in plain words and formulas." />
      <div className="max-w-4xl space-y-4">
        <article className="card p-4" data-testid="engine-methodology">
          <Markdown source={source.replace(/^# .*\n/, '')} />
        </article>
        <PlanningMethodology />
      </div>
    </>
  );
}
