'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError('The reporting periods', 'Nothing was changed. Try again in a moment.');
