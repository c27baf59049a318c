'use client';

import { sectionError } from '@/components/ui/section-error';

export default sectionError('The screenings list');
