/** The fleet import's columns: plain names with their units, mapped to the register's fields. */
export type ImportColumn = {
  name: string;
  field: string;
  kind: 'text' | 'number' | 'ref';
  required: boolean;
  help: string;
};

export const FLEET_COLUMNS: ImportColumn[] = [
  { name: 'unit_number', field: 'unitNumber', kind: 'text', required: true, help: 'Truck unit number, unique in the workspace; an existing unit is updated' },
  { name: 'payload_class', field: 'payloadClass', kind: 'text', required: false, help: 'Payload class, e.g. 300 t' },
  { name: 'engine_type', field: 'engineTypeId', kind: 'ref', required: true, help: 'Key of an engine type in the engine library' },
  { name: 'repower_offer', field: 'repowerOfferId', kind: 'ref', required: false, help: 'Key of a repower offer (may be empty)' },
  { name: 'engine_hours_h', field: 'engineHours', kind: 'number', required: true, help: 'Hours on the current engine since new or last overhaul (h), 0 or more' },
  { name: 'remaining_life_h', field: 'remainingLifeHours', kind: 'number', required: true, help: 'Operating hours the truck has left to run (h), above 0' },
  { name: 'annual_hours_h', field: 'annualHours', kind: 'number', required: true, help: 'Operating hours per year (h), above 0 and at most 8784' },
  { name: 'load_factor', field: 'loadFactor', kind: 'number', required: true, help: 'Average fraction of rated power, above 0 and at most 1' },
  { name: 'tonnes_per_hour', field: 'tonnesPerHour', kind: 'number', required: true, help: 'Productivity (t/h), above 0' },
  { name: 'fuel_burn_l_per_h', field: 'fuelBurnLitresPerHour', kind: 'number', required: false, help: 'Measured fuel burn (L/h), above 0; empty if not measured' },
  { name: 'notes', field: 'notes', kind: 'text', required: false, help: 'Free text (must not start with =, +, - or @)' },
];

export const FIELD_TO_COLUMN: Record<string, string> = Object.fromEntries(FLEET_COLUMNS.map((c) => [c.field, c.name]));

/**
 * Limits of the fleet import (listed in docs/methodology.md, "Input limits").
 * A 10,000-row fleet sheet written by Excel or exceljs is about 0.6 MB on disk
 * and unpacks to about 4 MB of sheet XML and 1.3 MB of shared strings (each
 * part stored about 10 times smaller than it unpacks); with 2,000-character
 * notes on every row the shared strings reach about 20 MB. The XLSX limits
 * leave room for that and refuse an archive that would unpack to gigabytes.
 */
export const IMPORT_LIMITS = {
  /** The file as sent (CSV or XLSX). */
  maxBytes: 5 * 1024 * 1024,
  /** Data rows (not counting the header or blank rows). */
  maxRows: 10_000,
  /** Columns in a row, up to its last non-empty cell (the fleet sheet has 11). */
  maxColumns: 100,
  /** Files inside an XLSX archive (a saved workbook holds 10 to 30). */
  xlsxMaxEntries: 200,
  /** Declared unpacked size of one file inside the XLSX archive. */
  xlsxMaxEntryBytes: 50 * 1024 * 1024,
  /** Declared unpacked size of all files inside the XLSX archive together. */
  xlsxMaxTotalBytes: 100 * 1024 * 1024,
  /** Unpacked ÷ packed size of a file inside the archive that unpacks to more than `xlsxRatioFloorBytes` (sheet XML is about 10). */
  xlsxMaxRatio: 200,
  xlsxRatioFloorBytes: 1024 * 1024,
  /** Unpacked size of the styles part (read for number formats, so that a date stays a date): Excel's 64,000 cell formats take about 6 MB. */
  xlsxMaxStylesBytes: 10 * 1024 * 1024,
};
