import { PageSkeleton } from '@/components/fleets/skeleton';

export default function Loading() {
  return <PageSkeleton label="Loading the reporting periods…" blocks={2} />;
}
