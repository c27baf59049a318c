import { requireUser } from '@/lib/auth/guards';
import { TopBar } from '@/components/shell/top-bar';
import { Card, PageHeader } from '@/components/ui/card';
import { UnitsForm, SignOutEverywhereButton } from './account-forms';

export const metadata = { title: 'Account' };

export default async function AccountPage() {
  const user = await requireUser('/account');
  return (
    <div className="min-h-screen">
      <TopBar user={user} />
      <main id="main" className="mx-auto max-w-[800px] px-4 py-8">
        <PageHeader title="Account" lead={user.email} />
        <div className="space-y-6">
          <Card title="Units">
            <UnitsForm current={user.units} />
          </Card>
          <Card title="Sessions">
            <p className="mb-3 text-sm text-ink-soft">
              Sign out on every browser and device where this account is signed in, including this one.
            </p>
            <SignOutEverywhereButton />
          </Card>
        </div>
      </main>
    </div>
  );
}
