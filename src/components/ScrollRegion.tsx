import type { ReactNode } from 'react';

/**
 * A table that scrolls sideways inside its own box on a narrow screen instead of widening the
 * page: a named region that takes the keyboard's focus (ScrollRegion.astro, for pages).
 * @param props.label What the region holds, read out by screen readers.
 * @param props.className Further classes.
 */
export function ScrollRegion({ label, className, children }: { label: string; className?: string; children: ReactNode }) {
  return (
    <div className={className ? `overflow-x-auto ${className}` : 'overflow-x-auto'} role="region" aria-label={label} tabIndex={0}>
      {children}
    </div>
  );
}
