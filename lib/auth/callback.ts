/**
 * Only same-origin paths are followed after sign-in: browsers read `/\host` like `//host`,
 * so the path is resolved against this origin and kept only if it stays here.
 */
export function safeCallback(url: string | undefined, origin: string): string {
  if (!url || !url.startsWith('/')) return '/';
  try {
    const target = new URL(url, origin);
    return target.origin === origin ? `${target.pathname}${target.search}${target.hash}` : '/';
  } catch {
    return '/';
  }
}
