import { LibrarySkeleton } from '@/components/library/skeletons';

export default function Loading() {
  return <LibrarySkeleton what="engines and aircraft types" />;
}
