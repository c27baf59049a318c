'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError('The flights', 'Nothing was changed. Try again; if it keeps failing, clear the filters.');
