/** Kneepoint's mark: a flat discharge plateau that bends at the knee and drops. */
export function Logo({ className = 'h-8 w-8' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect x="1" y="1" width="30" height="30" rx="8" className="fill-accent" />
      <path d="M6 10 L 17 12.5 Q 21 13.5 23 18 L 25.5 26" fill="none" strokeWidth="3" strokeLinecap="round" className="stroke-accent-ink" />
      <circle cx="20.6" cy="14.2" r="2.6" className="fill-accent-ink" />
    </svg>
  );
}
