/** The short caution on every page about repower work. */
export function SafetyCaution() {
  return (
    <aside
      role="note"
      aria-label="Safety caution"
      className="mt-8 rounded border border-caution-rule bg-caution-ground px-3 py-2 text-xs text-caution"
    >
      <strong className="font-semibold">Caution.</strong> These figures inform capital decisions; they do not certify an
      engine installation. Engine swaps, electrical work and load testing on haul trucks follow the manufacturer&rsquo;s
      procedures, site safety rules and local codes, and are done by licensed, qualified people.
    </aside>
  );
}
