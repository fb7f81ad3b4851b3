import { PrintDate } from './print-date';

/**
 * The line at the top of a printed case page: case, workspace and the date it
 * was printed. Hidden on screen (`print:block`); the print stylesheet in
 * app/globals.css hides the rail, navigation and controls.
 */
export function PrintHeader({ caseName, workspaceName, what }: { caseName: string; workspaceName: string; what: string }) {
  return (
    <div className="mb-3 hidden border-b border-ink pb-1 text-xs print:flex print:justify-between" data-testid="print-header">
      <span>
        <strong>{caseName}</strong> · {what} · {workspaceName}
      </span>
      <span>
        Printed <PrintDate />
      </span>
    </div>
  );
}
