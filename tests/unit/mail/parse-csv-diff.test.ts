import { describe, expect, it } from 'vitest';
import { decodeWords, parseMail } from '@/lib/mail/parse';
import { csvCell, toCsv } from '@/lib/csv';
import { diffAudit } from '@/lib/audit-diff';

describe('reading our own MIME messages', () => {
  it('reads a multipart/alternative message with quoted-printable and base64 parts and an encoded subject', () => {
    const raw = [
      'From: Haulcase <no-reply@haulcase.test>',
      'To: approver@aldervane.test',
      'Subject: =?UTF-8?Q?Approval_requested:_North_Pit_=E2=80=94_2027?=',
      'X-Haulcase-Workspace: aldervane-north-pit',
      'Content-Type: multipart/alternative;',
      ' boundary="--_b1"',
      '',
      '----_b1',
      'Content-Type: text/plain; charset=utf-8',
      'Content-Transfer-Encoding: quoted-printable',
      '',
      'Review it here: http://127.0.0.1:3000/aldervane-north-pit/approvals/=',
      '7 =E2=80=9Cnow=E2=80=9D',
      '----_b1',
      'Content-Type: text/html; charset=utf-8',
      'Content-Transfer-Encoding: base64',
      '',
      Buffer.from('<p>Hello — <a href="x">link</a></p>').toString('base64'),
      '----_b1--',
      '',
    ].join('\r\n');
    const m = parseMail(raw);
    expect(m.subject).toBe('Approval requested: North Pit — 2027');
    expect(m.headers['x-haulcase-workspace']).toBe('aldervane-north-pit');
    expect(m.text).toBe('Review it here: http://127.0.0.1:3000/aldervane-north-pit/approvals/7 “now”');
    expect(m.html).toBe('<p>Hello — <a href="x">link</a></p>');
  });

  it('decodes base64 encoded words and leaves plain text alone', () => {
    expect(decodeWords(`=?UTF-8?B?${Buffer.from('Coût — ok').toString('base64')}?=`)).toBe('Coût — ok');
    expect(decodeWords('Plain subject')).toBe('Plain subject');
  });
});

describe('CSV cells', () => {
  it('neutralises cells a spreadsheet would run as formulas', () => {
    expect(csvCell('=HYPERLINK("http://x")')).toBe(`"'=HYPERLINK(""http://x"")"`);
    expect(csvCell('+1')).toBe("'+1");
    expect(csvCell('-2+3')).toBe("'-2+3");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\tx')).toBe("'\tx");
    expect(csvCell('plain')).toBe('plain');
    expect(csvCell('HT-101')).toBe('HT-101');
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell(42)).toBe('42');
    expect(csvCell(-1234.5)).toBe('-1234.5'); // a negative number stays a number
    expect(csvCell(Number.NaN)).toBe('');
  });

  it('quotes commas, quotes and line breaks (RFC 4180) with CRLF line ends', () => {
    expect(toCsv(['a', 'b'], [['x,y', 'say "hi"\nnow']])).toBe('a,b\r\n"x,y","say ""hi""\nnow"\r\n');
  });
});

describe('audit diff', () => {
  it('lists changed and added fields of an update, and what a delete removed', () => {
    // an update stores the whole row before and only the fields written after: "old" was not part of the change
    expect(diffAudit('{"status":"draft","version":1,"old":true}', '{"status":"submitted","version":2,"comment":"ok"}')).toEqual([
      { field: 'status', kind: 'changed', before: 'draft', after: 'submitted' },
      { field: 'comment', kind: 'added', after: 'ok' },
    ]);
    expect(diffAudit('{"id":3,"name":"T1"}', null)).toEqual([{ field: 'name', kind: 'removed', before: 'T1' }]);
    expect(diffAudit(null, '{"a":1}')).toEqual([{ field: 'a', kind: 'added', after: '1' }]);
    expect(diffAudit(null, null)).toEqual([]);
  });
});
