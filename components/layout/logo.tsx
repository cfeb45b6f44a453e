/** The Switchback mark: a road doubling back on itself, ending at the later reward (the amber dot). */
export function LogoMark({ className = 'h-8 w-8' }: { className?: string }) {
  return (
    <svg viewBox="0 0 64 64" className={className} aria-hidden="true">
      <rect width="64" height="64" rx="14" fill="#114b46" />
      <path d="M14 50 H42 a8 8 0 0 0 0-16 H22 a8 8 0 0 1 0-16 H50" fill="none" stroke="#faf8f3" strokeWidth="6" strokeLinecap="round" />
      <circle cx="50" cy="18" r="5" fill="#e2a23b" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2 text-lg font-semibold tracking-tight text-teal-700">
      <LogoMark className="h-7 w-7" />
      Switchback
    </span>
  );
}
