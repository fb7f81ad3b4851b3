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

export const IMPORT_LIMITS = { maxBytes: 5 * 1024 * 1024, maxRows: 10_000 };
