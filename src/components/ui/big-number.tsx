import { splitQuantity } from '../../lib/units';

type Size = 'md' | 'lg' | 'room' | 'room-small';

// Room size is for the full-screen view, read from three metres away. The smallest sizes
// still fit "-45.82 A" in half of a 390 px phone.
const VALUE_SIZE: Record<Size, string> = {
  md: 'text-2xl sm:text-4xl',
  lg: 'text-3xl sm:text-5xl md:text-6xl',
  room: 'text-[clamp(2rem,9vw,10rem)] leading-none',
  'room-small': 'text-[clamp(1.5rem,4.5vw,5rem)] leading-none',
};
const UNIT_SIZE: Record<Size, string> = {
  md: 'text-base',
  lg: 'text-xl',
  room: 'text-[clamp(1.5rem,3vw,3.5rem)]',
  'room-small': 'text-[clamp(1rem,1.8vw,2rem)]',
};
const LABEL_SIZE: Record<Size, string> = {
  md: 'text-xs',
  lg: 'text-sm',
  room: 'text-[clamp(1rem,1.6vw,2rem)]',
  'room-small': 'text-[clamp(0.9rem,1.3vw,1.5rem)]',
};

export interface BigNumberProps {
  label: string;
  /** Already formatted with its unit by shared/units, e.g. "25.60 V". */
  text: string;
  /** Unit shown even when the value is missing, so a dash never stands alone. */
  unit: string;
  color?: string;
  size?: Size;
  /** The reading is old: drawn in the faint ink instead of its signal colour (still legible). */
  stale?: boolean;
}

/** A number meant to be read from across the room: big digits, unit beside, label above. */
export function BigNumber({ label, text, unit, color, size = 'lg', stale = false }: BigNumberProps) {
  const q = splitQuantity(text, unit);
  return (
    <div className="flex min-w-0 flex-col">
      <span className={`${LABEL_SIZE[size]} font-semibold uppercase tracking-wider text-ink-muted`}>{label}</span>
      <span className="flex items-baseline gap-2 whitespace-nowrap">
        <span
          className={`num ${VALUE_SIZE[size]} font-bold ${stale ? 'text-ink-faint' : ''}`}
          style={color && !stale ? { color } : undefined}
          data-stale={stale || undefined}
          data-testid={`big-${label.toLowerCase().replace(/\s+/g, '-')}`}
        >
          {q.value}
        </span>
        <span className={`${UNIT_SIZE[size]} font-semibold text-ink-muted`}>{q.unit}</span>
      </span>
    </div>
  );
}
