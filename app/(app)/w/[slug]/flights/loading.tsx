import { ImportsSkeleton } from '@/components/imports/skeleton';

export default function Loading() {
  return <ImportsSkeleton label="Loading the flights…" blocks={3} />;
}
