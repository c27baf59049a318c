'use client';

import { LibraryError } from '@/components/library/library-error';

export default function ErrorBoundary({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <LibraryError what="Fixes & airways" reset={reset} />;
}
