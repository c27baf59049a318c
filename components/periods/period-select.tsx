'use client';

import { useRouter } from 'next/navigation';
import { SelectInput } from '@/components/ui/field';

export interface PeriodOption {
  ref: string;
  name: string;
  from: string;
  to: string;
}

interface Props {
  id: string;
  label: string;
  options: PeriodOption[];
  /** The ref currently chosen, or '' for none. */
  value: string;
  /** Where a choice goes: the page path plus the query for the chosen period. */
  hrefFor: { path: string; mode: 'range' | 'ref' };
}

/** Sets a page to a reporting period: the fleet comparison by its dates, the overview by its reference. */
export function PeriodSelect({ id, label, options, value, hrefFor }: Props) {
  const router = useRouter();
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm">
      <label htmlFor={id} className="font-medium text-ink-soft">
        {label}
      </label>
      <SelectInput
        id={id}
        value={value}
        className="w-auto max-w-[16rem]"
        onChange={(e) => {
          const p = options.find((o) => o.ref === e.target.value);
          if (!p) return router.push(hrefFor.path);
          const q = hrefFor.mode === 'range' ? `from=${p.from}&to=${p.to}` : `period=${encodeURIComponent(p.ref)}`;
          router.push(`${hrefFor.path}?${q}`);
        }}
      >
        <option value="">Choose a period…</option>
        {options.map((o) => (
          <option key={o.ref} value={o.ref}>
            {o.name}
          </option>
        ))}
      </SelectInput>
    </div>
  );
}
