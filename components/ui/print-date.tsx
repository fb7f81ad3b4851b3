'use client';

import { useEffect, useState } from 'react';

const today = () => new Date().toISOString().slice(0, 16).replace('T', ' ') + ' UTC';

/**
 * The date and time of printing, and fits the page's charts to the paper: an
 * SVG drawn at the screen's width gets a viewBox of its own size, so the print
 * stylesheet's `max-width: 100%` scales it instead of clipping it.
 */
export function PrintDate() {
  const [now, setNow] = useState('');
  useEffect(() => {
    const update = () => {
      setNow(today());
      for (const svg of document.querySelectorAll<SVGSVGElement>('main svg:not([viewBox])')) {
        const w = Number(svg.getAttribute('width'));
        const h = Number(svg.getAttribute('height'));
        if (w > 0 && h > 0) svg.setAttribute('viewBox', `0 0 ${w} ${h}`);
      }
    };
    update();
    const media = window.matchMedia('print');
    window.addEventListener('beforeprint', update);
    media.addEventListener('change', update);
    return () => {
      window.removeEventListener('beforeprint', update);
      media.removeEventListener('change', update);
    };
  }, []);
  return <span suppressHydrationWarning>{now}</span>;
}
