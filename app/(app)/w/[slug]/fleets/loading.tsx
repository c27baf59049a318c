import { PageSkeleton } from '@/components/fleets/skeleton';

export default function Loading() {
  return <PageSkeleton label="Loading the fleet comparison…" blocks={3} />;
}
