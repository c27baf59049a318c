import type { Metadata } from 'next';
import { connection } from 'next/server';
import './globals.css';
import { inter } from './fonts';
import { Providers } from '@/components/shell/providers';

export const metadata: Metadata = {
  title: { default: 'Tropopass', template: '%s · Tropopass' },
  description:
    'NOx above the tropopause and a catalytic ozone-loss screening figure for flight planning and fleet reporting.',
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page is rendered per request so that Next.js can put the proxy's CSP nonce on its scripts.
  await connection();
  return (
    <html lang="en" className={inter.variable}>
      <body className="min-h-screen bg-paper text-ink antialiased">
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
