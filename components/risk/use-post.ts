'use client';
import useSWR from 'swr';
import { sendJson, type ApiError } from '@/lib/fetcher';

/**
 * SWR over a POST that only computes (sensitivity endpoints): the key is the
 * URL and the JSON body, so a changed range is a new key and a redraw.
 */
export function usePost<T>(url: string | null, body: unknown) {
  const key = url ? [url, JSON.stringify(body)] : null;
  return useSWR<T, ApiError>(key, ([u, b]: [string, string]) => sendJson<T>(u, 'POST', JSON.parse(b)), {
    keepPreviousData: true,
    revalidateOnFocus: false,
  });
}
