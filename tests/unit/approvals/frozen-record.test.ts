import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalJson, frozenHashOf, hashedBytes, readFrozenRecord, sha256Hex, verifyFrozen } from '@/lib/approvals/canonical';

// SHA-256 of "abc" is the FIPS 180-2 example digest (published test vector).
describe('the frozen record', () => {
  it('hashes the UTF-8 bytes of the text (FIPS 180-2 "abc" vector)', () => {
    expect(sha256Hex('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  const record = { format: 'frozen-record/1', caseId: 1, case: { format: 'case/1', name: 'Ä' }, result: { format: 'case-result/1' }, proposal: {}, summary: {}, pinnedRun: null };
  const text = canonicalJson(record);
  const row = { frozenRecord: text, frozenCase: canonicalJson(record.case), frozenResult: canonicalJson(record.result), frozenHash: createHash('sha256').update(Buffer.from(text, 'utf8')).digest('hex') };

  it('verifies a record whose hash, case and result agree; the hashed bytes are the record', () => {
    expect(verifyFrozen(row)).toBe(true);
    expect(hashedBytes(row)).toBe(text);
    expect(readFrozenRecord(text)?.caseId).toBe(1);
  });

  it('does not verify when any byte of the record, the case text or the result text changes', () => {
    expect(verifyFrozen({ ...row, frozenRecord: text.replace('"caseId":1', '"caseId":2') })).toBe(false);
    expect(verifyFrozen({ ...row, frozenCase: row.frozenCase.replace('Ä', 'A') })).toBe(false);
    expect(verifyFrozen({ ...row, frozenResult: '{"format":"case-result/2"}' })).toBe(false);
    expect(verifyFrozen({ ...row, frozenHash: null })).toBe(false);
  });

  it('keeps a case frozen before records verifying on its two texts, and serves them joined by a newline', () => {
    const old = { frozenRecord: null, frozenCase: '{"a":1}', frozenResult: '{"b":2}', frozenHash: frozenHashOf('{"a":1}', '{"b":2}') };
    expect(verifyFrozen(old)).toBe(true);
    expect(hashedBytes(old)).toBe('{"a":1}\n{"b":2}');
    expect(sha256Hex(hashedBytes(old)!)).toBe(old.frozenHash);
    expect(readFrozenRecord(null)).toBeNull();
    expect(readFrozenRecord('not json')).toBeNull();
  });
});
