/** The Duskline mark: a sagging span with one lit marker. */
export function Brand({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" className="h-7 w-7" aria-hidden="true">
        <rect width="32" height="32" rx="6" fill="#131d3b" />
        <path d="M2 12 Q16 22 30 12" stroke="#c3cbe6" strokeWidth="1.5" fill="none" />
        <circle cx="16" cy="16.9" r="4" fill="#f5b342" />
      </svg>
      Duskline
    </span>
  );
}
