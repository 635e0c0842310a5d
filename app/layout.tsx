import type { Metadata } from 'next';
import localFont from 'next/font/local';
import { connection } from 'next/server';
import { QueryProvider } from '@/components/ui/query-provider';
import './globals.css';

const sans = localFont({ src: './fonts/inter-latin-wght.woff2', variable: '--font-sans', display: 'swap' });
const mono = localFont({ src: './fonts/jetbrains-mono-latin-wght.woff2', variable: '--font-mono', display: 'swap' });

export const metadata: Metadata = {
  title: 'Cellwright',
  description: 'A browser bench for wiring, running and proving the PLC–robot handshake of a robot cell.',
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request: its scripts must carry that request's CSP nonce
  // (proxy.ts), which a page prerendered at build time cannot (Next.js 16 CSP guide,
  // "Forcing dynamic rendering").
  await connection();
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen font-sans">
        <QueryProvider>{children}</QueryProvider>
      </body>
    </html>
  );
}
