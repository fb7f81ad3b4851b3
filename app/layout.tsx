import type { Metadata } from 'next';
import localFont from 'next/font/local';
import './globals.css';

const sans = localFont({
  src: [
    { path: './fonts/ibm-plex-sans-latin-400-normal.woff2', weight: '400', style: 'normal' },
    { path: './fonts/ibm-plex-sans-latin-500-normal.woff2', weight: '500', style: 'normal' },
    { path: './fonts/ibm-plex-sans-latin-600-normal.woff2', weight: '600', style: 'normal' },
  ],
  variable: '--font-sans',
  display: 'swap',
});
const mono = localFont({
  src: [{ path: './fonts/jetbrains-mono-latin-400-normal.woff2', weight: '400', style: 'normal' }],
  variable: '--font-mono',
  display: 'swap',
});

// Every page renders per request: the Content-Security-Policy from proxy.ts carries
// a fresh nonce, which Next puts on its scripts only when it renders the page.
export const dynamic = 'force-dynamic';

export const metadata: Metadata = {
  title: { default: 'Haulcase', template: '%s · Haulcase' },
  description: 'Keep, rebuild or repower: haul truck engine business cases.',
};

export default function RootLayout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen antialiased">{children}</body>
    </html>
  );
}
