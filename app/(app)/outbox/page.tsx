import { notFound } from 'next/navigation';
import { env } from '@/lib/env';
import { Card, EmptyState, PageHeader } from '@/components/ui/card';
import { formatDateTime } from '@/lib/format';

export const metadata = { title: 'Outbox' };
export const dynamic = 'force-dynamic';

interface OutboxMessage {
  id: number;
  receivedAt: string;
  to: string[];
  subject: string;
  text: string;
  attachments: { filename: string; size: number }[];
}

/** The local mail catcher's messages; only when MAIL_OUTBOX=1 (demo and tests). */
export default async function OutboxPage() {
  const e = env();
  if (!e.MAIL_OUTBOX) notFound();
  let items: OutboxMessage[] = [];
  let problem: string | undefined;
  try {
    const res = await fetch(`${e.MAIL_FAKE_HTTP_URL}/messages`, { cache: 'no-store' });
    items = ((await res.json()) as { items: OutboxMessage[] }).items;
  } catch {
    problem = 'The local mail catcher is not running.';
  }
  return (
    <main id="main" className="mx-auto max-w-[900px] px-4 py-8">
      <PageHeader
        title="Outbox (local mail catcher)"
        lead="Every e-mail the app sent on this machine, sign-in, reset and invitation links included. It exists only while the app runs on a loopback address (the server refuses to start with MAIL_OUTBOX=1 otherwise): never switch it on in a deployment."
      />
      {problem ? <EmptyState title={problem} /> : items.length === 0 ? <EmptyState title="No e-mail sent yet" /> : null}
      <div className="space-y-4">
        {items.map((m) => (
          <Card key={m.id} title={m.subject}>
            <p className="text-xs text-ink-faint">
              To {m.to.join(', ')} · {formatDateTime(m.receivedAt)}
              {m.attachments.length
                ? ` · attachments: ${m.attachments.map((a) => `${a.filename} (${Math.round(a.size / 1024)} kB)`).join(', ')}`
                : ''}
            </p>
            <pre data-testid="mail-text" className="mt-3 whitespace-pre-wrap break-all font-sans text-sm">
              {m.text}
            </pre>
          </Card>
        ))}
      </div>
    </main>
  );
}
