import { useEffect } from 'react';
import { sharedAlarmSound, type AlarmSound } from '../../lib/alarm-sound';
import type { LiveStore } from '../../lib/live-store';
import { useLiveView } from '../../lib/use-live';
import { notify } from '../../lib/notify';
import { useShortcut } from '../../lib/use-shortcut';
import { describeEvent, type EventUnits } from '../ui/run-events-list';
import { MonoNumbers } from '../ui/mono-numbers';
import { useCutoffAlarm } from './use-cutoff-alarm';
import { useServerAcknowledge } from './use-server-acknowledge';

const TITLE_FLASH_MS = 1_000;

type AlarmSize = 'compact' | 'normal' | 'large';
const HEADLINE: Record<AlarmSize, string> = {
  compact: 'text-xl',
  normal: 'text-3xl',
  large: 'text-[clamp(2.5rem,5vw,6rem)] leading-none',
};
const DETAIL: Record<AlarmSize, string> = { compact: 'text-sm', normal: 'text-lg', large: 'text-[clamp(1.1rem,2vw,2.2rem)]' };

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
 * when a run cuts off. Silence (S) quiets this browser only; Acknowledge (A) tells the
 * server a person has taken the alarm (recorded with who and when; escalation stops) and
 * then quiets it here too.
 */
export function CutoffAlarm({ store, label, sound, size = 'normal', units = {} }: { store: LiveStore; label: string; sound?: Pick<AlarmSound, 'start' | 'stop'>; size?: AlarmSize; units?: EventUnits }) {
  const view = useLiveView(store);
  const { alarm, acknowledge: silence } = useCutoffAlarm(store, view);
  const server = useServerAcknowledge(view.run?.id ?? null, silence);
  const player = sound ?? sharedAlarmSound;
  const title = alarm ? `⚠ ${alarm.event.type === 'cutoff' ? 'CUTOFF' : 'ALARM'} · ${label}` : null;
  useFlashingTitle(title);
  useShortcut('s', silence, alarm !== null);
  useShortcut('a', server.acknowledge, alarm !== null);

  const alarmKey = alarm ? alarm.keys.join('|') : null;
  const detail = alarm ? describeEvent(alarm.event, units) : '';
  useEffect(() => {
    if (!alarmKey) return;
    notify(title ?? 'Kneepoint alarm', detail, alarmKey);
    player.start(alarmKey);
    return () => player.stop(alarmKey);
  }, [alarmKey, player]); // eslint-disable-line react-hooks/exhaustive-deps -- one notification per alarm, not per render

  if (!alarm) return null;
  return (
    <div role="alert" className={`alarm-pulse flex flex-wrap items-center justify-between gap-3 rounded-2xl bg-state-cutoff text-on-tone shadow-lg ${size === 'compact' ? 'p-3' : 'p-5'}`}>
      <div>
        <p className={`${HEADLINE[size]} font-black tracking-tight`}>{alarm.event.type === 'cutoff' ? 'CUTOFF' : 'ALARM'} · {label}</p>
        <p className={`mt-1 font-medium ${DETAIL[size]}`}><MonoNumbers text={detail} />
        </p>
      </div>
      <div className="flex flex-wrap items-center gap-2">
        {server.error && <p className="w-full font-semibold">Not acknowledged: {server.error}</p>}
        <button
          type="button"
          onClick={silence}
          className={`rounded-xl border-2 border-white font-bold hover:bg-white/10 ${size === 'compact' ? 'min-h-11 px-4' : 'min-h-14 px-6 text-lg'}`}
        >
          Silence (S)
        </button>
        <button
          type="button"
          onClick={server.acknowledge}
          disabled={server.busy}
          className={`rounded-xl bg-white font-bold text-state-cutoff hover:bg-white/90 ${size === 'compact' ? 'min-h-11 px-4' : 'min-h-14 px-6 text-lg'}`}
        >
          Acknowledge (A)
        </button>
      </div>
    </div>
  );
}
