/** Kneepoint's mark: a flat discharge plateau that bends at the knee and drops. */
export function Logo({ className = 'h-8 w-8' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect x="1" y="1" width="30" height="30" rx="8" className="fill-accent" />
      <path d="M6 11 C 12 12, 17 13, 20 15 S 24 20, 26 26" fill="none" strokeWidth="3" strokeLinecap="round" className="stroke-accent-ink" />
      <circle cx="20" cy="15" r="2.6" className="fill-accent-ink" />
    </svg>
  );
}
