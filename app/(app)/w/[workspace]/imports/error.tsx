'use client';

import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';

export default function ImportsError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <Notice tone="danger" role="alert" title="The imports could not be shown">
      <p>No import was changed, and screening carries on in the background. Try again in a moment.</p>
      <div className="mt-3">
        <Button variant="secondary" onClick={reset}>
          Try again
        </Button>
      </div>
    </Notice>
  );
}
