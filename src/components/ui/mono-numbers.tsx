import { Fragment } from 'react';

// A number with its optional unit: "1,198.1 Wh", "-4.5 °C", "93 %", "1 min", "02:00:49".
const NUMBER_WITH_UNIT = /(-?\d[\d,:]*(?:\.\d+)?(?:\s?(?:kWh|Wh|mAh|Ah|V|A|W|°C|°F|%|mΩ|min|h|s)(?![A-Za-z]))?)/g;

/** Sets the numbers of a sentence in JetBrains Mono, like every other number in the app. */
export function MonoNumbers({ text }: { text: string }) {
  const parts = text.split(NUMBER_WITH_UNIT);
  return (
    <>
      {parts.map((part, i) =>
        i % 2 === 1 ? (
          <span key={i} className="num">
            {part}
          </span>
        ) : (
          <Fragment key={i}>{part}</Fragment>
        ),
      )}
    </>
  );
}
