import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from 'react';

export function Table({ children, caption }: { children: ReactNode; caption?: string }) {
  return (
    // relative: absolutely placed children (screen-reader-only header text) scroll inside the box instead of widening the page
    <div className="relative overflow-x-auto rounded-lg border border-ink/10 bg-paper-raised">
      <table className="min-w-full divide-y divide-ink/10 text-sm">
        {caption ? <caption className="sr-only">{caption}</caption> : null}
        {children}
      </table>
    </div>
  );
}

/** A column header. Never upper-cased: symbols such as k and K must keep their case. */
export function Th({ className = '', ...props }: ThHTMLAttributes<HTMLTableCellElement>) {
  return <th scope="col" className={`px-4 py-2 text-left text-xs font-semibold text-ink-soft ${className}`} {...props} />;
}

export function Td({ className = '', ...props }: TdHTMLAttributes<HTMLTableCellElement>) {
  return <td className={`px-4 py-2 align-top ${className}`} {...props} />;
}
