'use client';

import { useRouter } from 'next/navigation';
import { ScreenFlightForm, type ScreenFlightFormProps } from '@/components/screening/screen-form';

/** The form with navigation to the saved screening's page. */
export function ScreenFormIsland(props: Omit<ScreenFlightFormProps, 'onSaved'>) {
  const router = useRouter();
  return <ScreenFlightForm {...props} onSaved={(id) => router.push(`/w/${props.slug}/screenings/${id}`)} />;
}
