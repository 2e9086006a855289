import type { Metadata, Viewport } from 'next';
import localFont from 'next/font/local';
import { connection } from 'next/server';
import './globals.css';

// Fonts ship with the app (fonts/), nothing is downloaded at build or run time.
const inter = localFont({
  src: [
    { path: '../fonts/inter-latin-400-normal.woff2', weight: '400', style: 'normal' },
    { path: '../fonts/inter-latin-600-normal.woff2', weight: '600', style: 'normal' },
    { path: '../fonts/inter-latin-700-normal.woff2', weight: '700', style: 'normal' },
  ],
  variable: '--font-inter',
  display: 'swap',
});

export const metadata: Metadata = {
  title: { default: 'Tallyvat', template: '%s · Tallyvat' },
  description: 'Batch records, a fair shared tank and monthly billing for community biodiesel co-ops.',
};

export const viewport: Viewport = { width: 'device-width', initialScale: 1, themeColor: '#1d3f33' };

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page renders per request: its scripts carry the request's CSP nonce (see proxy.ts).
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen font-sans">{children}</body>
    </html>
  );
}
