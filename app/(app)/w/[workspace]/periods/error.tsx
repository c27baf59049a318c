'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

export default function PeriodsError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <Notice tone="danger" role="alert" title="The reporting periods could not be shown">
      <p>Nothing was changed. Try again in a moment.</p>
      <div className="mt-3">
        <Button variant="secondary" onClick={reset}>
          Try again
        </Button>
      </div>
    </Notice>
  );
}
