'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError('The reports', 'Nothing was changed. Try again in a moment.');
