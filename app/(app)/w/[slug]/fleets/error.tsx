'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError(
  'The fleets page',
  'Nothing was changed. Try again; if it keeps failing, narrow the period or clear the filters.',
);
