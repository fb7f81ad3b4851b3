/**
 * Plain words for the audit log: what kind of thing changed and how
 * ("Business case: plan changed" for business_case / update-plan), and which
 * one ("Truck CT-114", "Business case “North Pit fleet”"). Pure, shared by the
 * page, the API and the CSV.
 */

export const ENTITY_LABELS: Record<string, string> = {
  truck: 'Truck',
  engine_type: 'Engine type',
  repower_offer: 'Repower offer',
  quote_document: 'Quote document',
  assumption_set: 'Assumption set',
  business_case: 'Business case',
  case_file: 'Case file',
  monte_carlo_run: 'Monte Carlo run',
  membership: 'Member',
  invitation: 'Invitation',
  workspace_settings: 'Workspace settings',
  workspace: 'Workspace',
  user: 'Account',
};

export const ACTION_LABELS: Record<string, string> = {
  create: 'created',
  update: 'changed',
  delete: 'deleted',
  rename: 'renamed',
  'update-plan': 'plan changed',
  'update-engine-lives': 'engine lives changed',
  copy: 'copied',
  'create-revision': 'new revision',
  reforecast: 're-forecast from readings',
  submit: 'submitted for approval',
  approve: 'approved',
  reject: 'rejected',
  return: 'sent back for changes',
  import: 'imported',
  upload: 'uploaded',
  run: 'run started',
  cancel: 'run cancelled',
  invite: 'invited',
  accept: 'invitation accepted',
  'change-role': 'role changed',
  remove: 'removed',
  seed: 'demo data loaded',
  'request-reset': 'password reset requested',
  'reset-password': 'password reset',
};

/** "business_case" → "Business case" when unknown: a readable fallback for codes added later. */
const humanise = (code: string) => {
  const words = code.replace(/[_-]+/g, ' ').trim();
  return words ? words[0].toUpperCase() + words.slice(1) : code;
};

export const entityLabel = (entity: string) => ENTITY_LABELS[entity] ?? humanise(entity);
export const actionLabel = (action: string) => ACTION_LABELS[action] ?? humanise(action).toLowerCase();

/** The filter's words for a kind `entity` or `entity:action`. */
export function kindLabel(entity: string, action?: string): string {
  return action ? `${entityLabel(entity)}: ${actionLabel(action)}` : `${entityLabel(entity)}: any change`;
}

/** Kinds whose name reads better in quotes (free-text names rather than codes). */
const QUOTED = new Set(['business_case', 'assumption_set', 'quote_document']);

/**
 * "Truck CT-114", "Business case “Base”", or "Truck #9" when no name is known
 * (a row removed before names were recorded), "Truck import" with no id.
 */
export function describeEntity(entity: string, entityId: string | null, name: string | null | undefined): string {
  const label = entityLabel(entity);
  if (name) return QUOTED.has(entity) ? `${label} “${name}”` : `${label} ${name}`;
  if (entityId == null || entityId === '') return label;
  return `${label} #${entityId}`;
}

/** The name an audit row recorded for its entity (as it was then), from its after or before JSON. */
export function recordedName(entity: string, before: unknown, after: unknown, showEmail: boolean): string | null {
  const field: Record<string, string[]> = {
    truck: ['unitNumber'],
    engine_type: ['name', 'key'],
    repower_offer: ['key'],
    assumption_set: ['name'],
    business_case: ['name'],
    quote_document: ['fileName'],
    membership: showEmail ? ['email'] : [],
    invitation: showEmail ? ['email'] : [],
  };
  for (const side of [after, before]) {
    if (!side || typeof side !== 'object' || Array.isArray(side)) continue;
    for (const f of field[entity] ?? []) {
      const v = (side as Record<string, unknown>)[f];
      if (typeof v === 'string' && v.trim()) return v;
    }
  }
  return null;
}

/** E-mail addresses taken out of an audit row's JSON for readers who may not see them. */
export function withoutEmails(text: string | null): string | null {
  if (text == null) return text;
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch {
    return text.replace(/[^\s@"]+@[^\s@"]+/g, '(address hidden)');
  }
  const strip = (v: unknown): unknown => {
    if (Array.isArray(v)) return v.map(strip);
    if (v && typeof v === 'object') {
      return Object.fromEntries(Object.entries(v).filter(([k]) => !/^(email|to|cc|bcc)$/i.test(k)).map(([k, x]) => [k, strip(x)]));
    }
    return v;
  };
  return JSON.stringify(strip(value));
}

const FIELD_LABELS: Record<string, string> = {
  unitNumber: 'Unit', payloadClass: 'Payload class', engineTypeId: 'Engine type (id)', repowerOfferId: 'Repower offer (id)',
  engineHours: 'Engine hours (h)', remainingLifeHours: 'Remaining life (h)', annualHours: 'Annual hours (h/yr)', loadFactor: 'Load factor',
  tonnesPerHour: 'Productivity (t/h)', fuelBurnLitresPerHour: 'Fuel burn (L/h)', ratedKw: 'Rated power (kW)', bsfcGPerKwh: 'BSFC (g/kWh)',
  lifeHours: 'Planned life (h)', assumptionSetId: 'Assumption set (id)', fileName: 'File name', expiresAt: 'Link expires (UTC)',
};

/** "engineHours" → "Engine hours (h)"; other field codes in words ("failedCoreCredit" → "Failed core credit"). */
export function fieldLabel(field: string): string {
  if (FIELD_LABELS[field]) return FIELD_LABELS[field];
  if (field.startsWith('(')) return field;
  const words = field.replace(/([a-z0-9])([A-Z])/g, '$1 $2').replace(/[_-]+/g, ' ').toLowerCase();
  return words ? words[0].toUpperCase() + words.slice(1) : field;
}
