import { describe, expect, it } from 'vitest';
import { diffAudit } from '@/lib/audit-diff';
import { describeEntity, fieldLabel, kindLabel, recordedName, withoutEmails } from '@/lib/audit-labels';

const j = (v: unknown) => JSON.stringify(v);

describe('diffAudit: only what changed', () => {
  it('an update (whole row before, written fields after) lists the changed field only, not the unchanged or book-keeping ones', () => {
    const before = { id: 9, workspaceId: 1, unitNumber: 'CT-114', engineHours: 12000, annualHours: 6000, notes: '', version: 3, createdAt: '2026-01-01T00:00:00.000Z', createdBy: 1, updatedAt: '2026-02-01T00:00:00.000Z', updatedBy: 2 };
    const after = { unitNumber: 'CT-114', engineHours: 12500, annualHours: 6000, notes: '' };
    expect(diffAudit(j(before), j(after))).toEqual([{ field: 'engineHours', kind: 'changed', before: '12000', after: '12500' }]);
  });

  it('a case snapshot with a new version and plan lists the plan, not the version', () => {
    const before = { name: 'Base', plan: { swapsPerMonth: 2 }, status: 'draft', version: 1 };
    const after = { name: 'Base', plan: { swapsPerMonth: 3 }, status: 'draft', version: 2 };
    expect(diffAudit(j(before), j(after))).toEqual([{ field: 'plan', kind: 'changed', before: '{"swapsPerMonth":2}', after: '{"swapsPerMonth":3}' }]);
  });

  it('a create lists what was set; a delete what was removed, both without book-keeping fields', () => {
    expect(diffAudit(null, j({ unitNumber: 'T1', engineHours: 5 }))).toEqual([
      { field: 'unitNumber', kind: 'added', after: 'T1' },
      { field: 'engineHours', kind: 'added', after: '5' },
    ]);
    expect(diffAudit(j({ id: 4, workspaceId: 1, unitNumber: 'T1', version: 2, createdAt: 'x' }), null)).toEqual([{ field: 'unitNumber', kind: 'removed', before: 'T1' }]);
  });

  it('a field newly written in an update shows as added; a plain value and nothing at all are handled', () => {
    expect(diffAudit(j({ notes: '' }), j({ notes: '', comment: 'why' }))).toEqual([{ field: 'comment', kind: 'added', after: 'why' }]);
    expect(diffAudit(null, null)).toEqual([]);
    expect(diffAudit('"-5"', null)).toEqual([{ field: '(value)', kind: 'removed', before: '-5' }]);
    expect(diffAudit(j({ a: 1 }), j({ a: 1 }))).toEqual([]);
  });
});

describe('audit labels', () => {
  it('names kinds in plain words, with a readable fallback for codes added later', () => {
    expect(kindLabel('business_case', 'update-plan')).toBe('Business case: plan changed');
    expect(kindLabel('truck', 'import')).toBe('Truck: imported');
    expect(kindLabel('membership', 'change-role')).toBe('Member: role changed');
    expect(kindLabel('engine_type')).toBe('Engine type: any change');
    expect(kindLabel('haul_road', 'regrade-surface')).toBe('Haul road: regrade surface');
  });

  it('names the unit or case, or falls back to the id', () => {
    expect(describeEntity('truck', '9', 'CT-114')).toBe('Truck CT-114');
    expect(describeEntity('business_case', '2', 'North Pit fleet')).toBe('Business case “North Pit fleet”');
    expect(describeEntity('truck', '9', null)).toBe('Truck #9');
    expect(describeEntity('truck', null, null)).toBe('Truck');
  });

  it('reads the recorded name from the row, and a member\'s address only for readers who may see it', () => {
    expect(recordedName('truck', { unitNumber: 'CT-114' }, undefined, false)).toBe('CT-114');
    expect(recordedName('engine_type', undefined, { key: 'ac-2600', name: '' }, false)).toBe('ac-2600');
    expect(recordedName('membership', { email: 'a@b.test' }, undefined, true)).toBe('a@b.test');
    expect(recordedName('membership', { email: 'a@b.test' }, undefined, false)).toBeNull();
  });

  it('takes e-mail addresses out of before/after for readers who may not see them', () => {
    expect(JSON.parse(withoutEmails(j({ email: 'x@y.test', role: 'viewer', nested: [{ to: ['x@y.test'], ok: 1 }] })) as string)).toEqual({ role: 'viewer', nested: [{ ok: 1 }] });
    expect(withoutEmails('sent to x@y.test today')).toBe('sent to (address hidden) today');
    expect(withoutEmails(null)).toBeNull();
  });

  it('names fields in words', () => {
    expect(fieldLabel('engineHours')).toBe('Engine hours (h)');
    expect(fieldLabel('failedCoreCredit')).toBe('Failed core credit');
    expect(fieldLabel('role')).toBe('Role');
    expect(fieldLabel('(value)')).toBe('(value)');
  });
});
