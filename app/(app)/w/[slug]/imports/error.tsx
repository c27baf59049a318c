'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError(
  'The imports',
  'No import was changed, and screening carries on in the background. Try again in a moment.',
);
