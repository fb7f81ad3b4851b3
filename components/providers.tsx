'use client';

import { SWRConfig } from 'swr';
import { fetcher } from '@/lib/fetcher';

export function Providers({ children, fallback }: { children: React.ReactNode; fallback?: Record<string, unknown> }) {
  return <SWRConfig value={{ fetcher, fallback, revalidateOnFocus: false }}>{children}</SWRConfig>;
}
