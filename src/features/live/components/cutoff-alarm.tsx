import { useEffect, useMemo } from 'react';
import { AlarmSound } from '../../../lib/alarm-sound';
import type { LiveStore } from '../../../lib/live-store';
import { useLiveView } from '../../../lib/use-live';
import { useShortcut } from '../../../lib/use-shortcut';
import { describeEvent } from '../../../components/ui/run-events-list';
import { useCutoffAlarm } from './use-cutoff-alarm';

const TITLE_FLASH_MS = 1_000;

/** Flashes the tab title so a cutoff shows even from another tab or a locked-down kiosk. */
function useFlashingTitle(text: string | null): void {
  useEffect(() => {
    if (!text) return;
    const original = document.title;
    let on = true;
    document.title = text;
    const timer = setInterval(() => {
      on = !on;
      document.title = on ? text : original;
    }, TITLE_FLASH_MS);
    return () => {
      clearInterval(timer);
      document.title = original;
    };
  }, [text]);
}

/**
 * The loud part of the product: a red banner, a repeating tone and a flashing tab title
 * when a run cuts off, until someone acknowledges it (button or the A key).
 */
export function CutoffAlarm({ store, label, sound, large = false }: { store: LiveStore; label: string; sound?: Pick<AlarmSound, 'start' | 'stop'>; large?: boolean }) {
  const view = useLiveView(store);
  const { alarm, acknowledge } = useCutoffAlarm(store, view);
  const player = useMemo(() => sound ?? new AlarmSound(), [sound]);
  const title = alarm ? `⚠ ${alarm.event.type === 'cutoff' ? 'CUTOFF' : 'ALARM'} · ${label}` : null;
  useFlashingTitle(title);
  useShortcut('a', acknowledge, alarm !== null);

  const alarmKey = alarm ? alarm.keys.join('|') : null;
  useEffect(() => {
    if (!alarmKey) return;
    player.start();
    return () => player.stop();
  }, [alarmKey, player]);

  if (!alarm) return null;
  return (
    <div role="alert" className="alarm-pulse flex flex-wrap items-center justify-between gap-4 rounded-2xl bg-state-cutoff p-5 text-white shadow-lg">
      <div>
        <p className={`${large ? 'text-[clamp(2.5rem,5vw,6rem)] leading-none' : 'text-3xl'} font-black tracking-tight`}>{alarm.event.type === 'cutoff' ? 'CUTOFF' : 'ALARM'} · {label}</p>
        <p className={`mt-1 font-medium ${large ? 'text-[clamp(1.1rem,2vw,2.2rem)]' : 'text-lg'}`}>{describeEvent(alarm.event)}</p>
      </div>
      <button
        type="button"
        onClick={acknowledge}
        className="min-h-14 rounded-xl bg-white px-6 text-lg font-bold text-state-cutoff hover:bg-white/90"
      >
        Acknowledge (A)
      </button>
    </div>
  );
}
