import { LibrarySkeleton } from '@/components/library/skeletons';

export default function Loading() {
  return <LibrarySkeleton what="soundings" />;
}
