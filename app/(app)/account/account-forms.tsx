'use client';

import { useState, useTransition } from 'react';
import { signOut } from 'next-auth/react';
import { Button } from '@/components/ui/button';
import { updateUnitsAction, signOutEverywhereAction } from './actions';

export function UnitsForm({ current }: { current: 'metric' | 'imperial' }) {
  const [units, setUnits] = useState(current);
  const [saved, setSaved] = useState<string>();
  const [pending, start] = useTransition();
  return (
    <fieldset className="space-y-2 text-sm">
      <legend className="mb-2 text-ink-soft">Figures and charts use these units. Stored values stay metric.</legend>
      {(
        [
          ['metric', 'Metric: km, m, kg'],
          ['imperial', 'Aviation: nautical miles, feet, pounds'],
        ] as const
      ).map(([value, label]) => (
        <label key={value} className="flex items-center gap-2">
          <input
            type="radio"
            name="units"
            value={value}
            checked={units === value}
            disabled={pending}
            onChange={() => {
              setUnits(value);
              start(async () => {
                const s = await updateUnitsAction({ units: value });
                setSaved(s?.ok ? 'Saved.' : s && !s.ok ? s.error.message : undefined);
              });
            }}
          />
          {label}
        </label>
      ))}
      {saved ? (
        <p role="status" className="text-xs text-tropo-strong">
          {saved}
        </p>
      ) : null}
    </fieldset>
  );
}

export function SignOutEverywhereButton() {
  const [pending, start] = useTransition();
  return (
    <Button
      variant="secondary"
      disabled={pending}
      onClick={() =>
        start(async () => {
          await signOutEverywhereAction();
          await signOut({ callbackUrl: '/signin' });
        })
      }
    >
      Sign out everywhere
    </Button>
  );
}
