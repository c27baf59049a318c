'use client';

import { SegmentError } from '@/components/screening/skeletons';

export default function ErrorBoundary({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <SegmentError what="Flight" reset={reset} />;
}
