'use client';

import { useId, useState, type KeyboardEvent } from 'react';
import { useQuery } from '@tanstack/react-query';
import { inputClass } from '@/components/ui/field';
import { useDebouncedValue } from './use-debounced-value';

export interface AirportOption {
  icao: string | null;
  iata: string | null;
  name: string;
  country: string;
  lat: number;
  lon: number;
}

const codeOf = (a: AirportOption): string => a.icao ?? a.iata ?? '';

async function fetchAirports(q: string, signal: AbortSignal): Promise<AirportOption[]> {
  const res = await fetch(`/api/v1/airports?q=${encodeURIComponent(q)}&limit=8`, {
    signal,
    headers: { accept: 'application/json' },
  });
  if (!res.ok) throw new Error('The airport list could not be reached.');
  return ((await res.json()) as { items: AirportOption[] }).items;
}

interface Props {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  onBlur: () => void;
  error?: string;
  name?: string;
  placeholder?: string;
}

/**
 * An airport code field with suggestions by code or name (ARIA combobox with a listbox): arrows move
 * through the suggestions, Enter takes one, Escape closes the list; a typed code is kept as typed.
 */
export function AirportCombobox({ id, label, value, onChange, onBlur, error, name, placeholder = 'EGLL' }: Props) {
  const listId = useId();
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const [picked, setPicked] = useState<AirportOption | null>(null);
  const q = useDebouncedValue(value.trim(), 200);
  const query = useQuery({
    queryKey: ['airports', q],
    queryFn: ({ signal }) => fetchAirports(q, signal),
    enabled: open && q.length >= 2,
    staleTime: 60_000,
    retry: false,
  });
  const options = open && q.length >= 2 ? (query.data ?? []) : [];
  const showList = open && q.length >= 2;

  const choose = (a: AirportOption) => {
    onChange(codeOf(a));
    setPicked(a);
    setOpen(false);
    setActive(-1);
  };

  const onKeyDown = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === 'ArrowDown') {
      e.preventDefault();
      setOpen(true);
      setActive((i) => (options.length ? (i + 1) % options.length : -1));
    } else if (e.key === 'ArrowUp') {
      e.preventDefault();
      setActive((i) => (options.length ? (i <= 0 ? options.length - 1 : i - 1) : -1));
    } else if (e.key === 'Enter') {
      if (showList && active >= 0 && options[active]) {
        e.preventDefault();
        choose(options[active]);
      }
    } else if (e.key === 'Escape') {
      if (open) {
        e.preventDefault();
        setOpen(false);
        setActive(-1);
      }
    }
  };

  const hint =
    picked && codeOf(picked) === value.trim().toUpperCase()
      ? `${picked.name}, ${picked.country}`
      : 'ICAO (EGLL) or IATA (LHR) code, or type a name';
  const describedBy = error ? `${id}-error` : `${id}-hint`;
  return (
    <div className="relative space-y-1">
      <label htmlFor={id} className="block text-sm font-medium text-ink">
        {label}
      </label>
      <input
        id={id}
        name={name}
        type="text"
        role="combobox"
        autoComplete="off"
        spellCheck={false}
        aria-autocomplete="list"
        aria-expanded={showList}
        aria-controls={listId}
        aria-activedescendant={showList && active >= 0 && options[active] ? `${listId}-${active}` : undefined}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        value={value}
        onChange={(e) => {
          onChange(e.target.value);
          setOpen(true);
          setActive(-1);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => {
          setOpen(false);
          setActive(-1);
          onBlur();
        }}
        onKeyDown={onKeyDown}
        className={`${inputClass} uppercase placeholder:normal-case`}
        placeholder={placeholder}
      />
      <ul
        id={listId}
        role="listbox"
        aria-label={`Airports matching ${value}`}
        hidden={!showList}
        className="absolute z-20 mt-1 max-h-72 w-full min-w-[18rem] overflow-auto rounded-md border border-line-strong bg-paper-raised py-1 text-sm shadow-lg"
      >
        {showList && query.isFetching && options.length === 0 ? (
          <li className="px-3 py-2 text-ink-faint">Looking up airports…</li>
        ) : null}
        {showList && query.isError ? (
          <li className="px-3 py-2 text-danger">The airport list could not be reached. Type the code instead.</li>
        ) : null}
        {showList && query.isSuccess && options.length === 0 ? (
          <li className="px-3 py-2 text-ink-faint">No airport matches “{q}”.</li>
        ) : null}
        {options.map((a, i) => (
          <li
            key={`${codeOf(a)}-${i}`}
            id={`${listId}-${i}`}
            role="option"
            aria-selected={i === active}
            onMouseDown={(e) => {
              e.preventDefault();
              choose(a);
            }}
            className={`cursor-pointer px-3 py-1.5 ${i === active ? 'bg-accent-soft' : 'hover:bg-paper-sunk'}`}
          >
            <span className="font-mono font-semibold">{codeOf(a)}</span>
            {a.icao && a.iata ? <span className="ml-1 font-mono text-ink-faint">{a.iata}</span> : null}
            <span className="ml-2 text-ink-soft">
              {a.name}, {a.country}
            </span>
          </li>
        ))}
      </ul>
      {error ? (
        <p id={`${id}-error`} role="alert" className="text-xs font-medium text-danger">
          {error}
        </p>
      ) : (
        <p id={`${id}-hint`} className="text-xs text-ink-faint">
          {hint}
        </p>
      )}
    </div>
  );
}
