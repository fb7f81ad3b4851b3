import type { ReactNode } from 'react';

/**
 * A small renderer for our own trusted Markdown documents (docs/*.md): headings,
 * paragraphs, bullet lists (one nested level), pipe tables, **bold**, *italics*
 * and `code`. Text becomes React text, never HTML, so nothing can be injected.
 */
function inline(text: string): ReactNode[] {
  const out: ReactNode[] = [];
  const re = /(\*\*[^*]+\*\*|\*[^*\s][^*]*\*|`[^`]+`)/g;
  let last = 0;
  for (const m of text.matchAll(re)) {
    if (m.index > last) out.push(text.slice(last, m.index));
    const t = m[0];
    if (t.startsWith('**')) out.push(<strong key={m.index}>{t.slice(2, -2)}</strong>);
    else if (t.startsWith('`')) out.push(<code key={m.index} className="rounded bg-paper px-1 font-mono text-[0.8rem]">{t.slice(1, -1)}</code>);
    else out.push(<em key={m.index}>{t.slice(1, -1)}</em>);
    last = m.index + t.length;
  }
  if (last < text.length) out.push(text.slice(last));
  return out;
}

const slugify = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');

type Item = { text: string; children: string[] };

export function Markdown({ source }: { source: string }) {
  const lines = source.replace(/\r\n/g, '\n').split('\n');
  const blocks: ReactNode[] = [];
  let i = 0;
  while (i < lines.length) {
    const line = lines[i];
    if (!line.trim()) { i++; continue; }
    const h = /^(#{1,3})\s+(.*)$/.exec(line);
    if (h) {
      const level = h[1].length;
      const cls = level === 1 ? 'text-lg font-semibold' : level === 2 ? 'mt-4 text-base font-semibold' : 'mt-3 text-sm font-semibold';
      const Tag = (`h${level + 1}`) as 'h2';
      blocks.push(<Tag key={i} id={slugify(h[2])} className={cls}>{inline(h[2])}</Tag>);
      i++;
      continue;
    }
    if (line.startsWith('|')) {
      const rows: string[][] = [];
      while (i < lines.length && lines[i].startsWith('|')) {
        if (!/^\|[\s|:-]+\|$/.test(lines[i])) rows.push(lines[i].slice(1, -1).split('|').map((c) => c.trim()));
        i++;
      }
      const [head, ...body] = rows;
      blocks.push(
        <table key={i} className="data-table my-2">
          <thead><tr>{head.map((c, j) => <th key={j}>{inline(c)}</th>)}</tr></thead>
          <tbody>{body.map((r, k) => <tr key={k}>{r.map((c, j) => <td key={j} className="h-auto py-1 align-top">{inline(c)}</td>)}</tr>)}</tbody>
        </table>,
      );
      continue;
    }
    if (line.startsWith('- ')) {
      const items: Item[] = [];
      while (i < lines.length && (lines[i].startsWith('- ') || lines[i].startsWith('  '))) {
        const l = lines[i];
        if (l.startsWith('- ')) items.push({ text: l.slice(2), children: [] });
        else if (l.trimStart().startsWith('- ')) items[items.length - 1].children.push(l.trimStart().slice(2));
        else {
          const last = items[items.length - 1];
          if (last.children.length) last.children[last.children.length - 1] += ` ${l.trim()}`;
          else last.text += ` ${l.trim()}`;
        }
        i++;
      }
      blocks.push(
        <ul key={i} className="my-2 list-disc space-y-1 pl-5">
          {items.map((it, k) => (
            <li key={k}>
              {inline(it.text)}
              {it.children.length ? <ul className="mt-1 list-[circle] space-y-0.5 pl-5">{it.children.map((c, j) => <li key={j}>{inline(c)}</li>)}</ul> : null}
            </li>
          ))}
        </ul>,
      );
      continue;
    }
    const para: string[] = [];
    while (i < lines.length && lines[i].trim() && !/^(#|\||- )/.test(lines[i])) para.push(lines[i++].trim());
    blocks.push(<p key={i} className="my-2">{inline(para.join(' '))}</p>);
  }
  return <div className="text-sm leading-relaxed">{blocks}</div>;
}
