const CAUTIONS = [
  {
    title: 'Lithium fire',
    text: 'A damaged or abused lithium pack can vent and burn. Test on a non-combustible surface, keep a suitable extinguisher and a clear exit, and never leave a pack near flammables.',
  },
  {
    title: 'Hydrogen near lead-acid',
    text: 'Charging lead-acid batteries gives off hydrogen. Ventilate the room and keep sparks and flames away from the terminals.',
  },
  {
    title: 'Short circuits',
    text: 'A pack can deliver hundreds of amps into a short. Insulate tools, remove rings and watches, fuse the leads, and connect the load last.',
  },
  {
    title: 'Cold charging',
    text: 'Charging lithium cells below 0 °C plates lithium and can cause an internal short later. Check the pack temperature before any charge.',
  },
  {
    title: 'Unattended tests',
    text: 'Long tests run for hours. Make sure alarms reach someone, and that a person can get to the bench quickly.',
  },
] as const;

/** Bench-safety cautions, shown wherever a test is started. Local codes and rules come first. */
export function SafetyCautions({ compact = false }: { compact?: boolean }) {
  return (
    <section aria-label="Safety cautions" className="rounded-xl border border-caution/50 bg-caution-surface p-4 text-ink">
      <h2 className="flex items-center gap-2 text-base font-bold text-caution">
        <svg viewBox="0 0 24 24" className="h-5 w-5" aria-hidden="true">
          <path d="M12 2 1 21h22L12 2zm0 6 1 7h-2l1-7zm-1 9h2v2h-2v-2z" fill="currentColor" />
        </svg>
        Safety before you start
      </h2>
      {compact ? (
        <p className="mt-2 text-sm">
          Lithium fire, hydrogen near lead-acid, short circuits, cold charging, unattended tests: check each before you
          start. Follow your local codes and your lab's rules; they take precedence over anything shown here.
        </p>
      ) : (
        <>
          <ul className="mt-3 grid gap-3 md:grid-cols-2">
            {CAUTIONS.map((c) => (
              <li key={c.title} className="text-sm">
                <strong className="block">{c.title}</strong>
                {c.text}
              </li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-ink-muted">
            These are reminders, not a safety procedure. Follow your local codes and your lab's rules; they take precedence.
          </p>
        </>
      )}
    </section>
  );
}
