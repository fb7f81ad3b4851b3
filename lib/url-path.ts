/**
 * Whether a request path cannot be percent-decoded ("/trucks/T%", a lone
 * "%E0%A4%A"). Next answers such a path with a 500 before any page or route
 * handler runs, so the proxy answers 404 for it first: a path that cannot be
 * decoded names nothing.
 */
export function hasBrokenPercentEncoding(pathname: string): boolean {
  try {
    decodeURIComponent(pathname);
    return false;
  } catch {
    return true;
  }
}
