import { PageSkeleton } from '@/components/screening/skeletons';

export default function Loading() {
  return <PageSkeleton title="your screenings" />;
}
