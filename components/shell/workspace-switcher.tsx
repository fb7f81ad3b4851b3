'use client';

import { useRouter } from 'next/navigation';

export function WorkspaceSwitcher({ current, workspaces }: { current: string; workspaces: Array<{ slug: string; name: string }> }) {
  const router = useRouter();
  return (
    <label className="mt-2 block">
      <span className="sr-only">Workspace</span>
      <select
        aria-label="Workspace"
        className="field py-1 text-sm font-medium"
        value={current}
        onChange={(e) => router.push(`/${e.target.value}`)}
      >
        {workspaces.map((w) => (
          <option key={w.slug} value={w.slug}>{w.name}</option>
        ))}
      </select>
    </label>
  );
}
