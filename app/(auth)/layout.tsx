import Link from 'next/link';

export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <Link href="/" className="mb-6 text-lg font-semibold tracking-tight text-ink">
        Tropo<span className="text-strato">pass</span>
      </Link>
      <main className="w-full max-w-md rounded-card border border-line bg-paper-raised p-6 shadow-sm">{children}</main>
    </div>
  );
}
