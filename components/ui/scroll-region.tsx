import type { ReactNode } from 'react';

/**
 * A horizontally scrolling box (wide tables, code samples) that keyboard users can reach and scroll:
 * it takes focus and names itself, as WCAG 2.1.1 asks of any scrollable region.
 */
export function ScrollRegion({
  label,
  children,
  className = '',
}: {
  label: string;
  children: ReactNode;
  className?: string;
}) {
  return (
    <div
      role="region"
      aria-label={label}
      tabIndex={0}
      className={`relative overflow-x-auto focus:outline-none focus-visible:ring-2 focus-visible:ring-accent ${className}`}
    >
      {children}
    </div>
  );
}
