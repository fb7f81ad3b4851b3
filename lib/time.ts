/** Current time as ISO-8601 UTC text, the form every timestamp column stores. */
export const nowIso = (): string => new Date().toISOString();
