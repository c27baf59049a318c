'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

export default function FlightsError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <Notice tone="danger" role="alert" title="The flights could not be shown">
      <p>Nothing was changed. Try again; if it keeps failing, clear the filters.</p>
      <div className="mt-3">
        <Button variant="secondary" onClick={reset}>
          Try again
        </Button>
      </div>
    </Notice>
  );
}
