'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

export default function FleetsError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <Notice tone="danger" role="alert" title="The fleets page could not be shown">
      <p>Nothing was changed. Try again; if it keeps failing, narrow the period or clear the filters.</p>
      <div className="mt-3">
        <Button variant="secondary" onClick={reset}>
          Try again
        </Button>
      </div>
    </Notice>
  );
}
