import { ImportsSkeleton } from '@/components/imports/skeleton';

export default function Loading() {
  return <ImportsSkeleton label="Loading the imports…" blocks={2} />;
}
