import { useState } from 'react';
import { notificationPermission, requestNotifications } from '../../lib/notify';

/** "Notify me on this device": lets a cutoff alarm reach someone in another tab or app. */
export function NotifyToggle() {
  const [permission, setPermission] = useState(notificationPermission);
  if (permission === 'unsupported') return null;
  if (permission === 'granted') return <span className="text-sm text-status-receiving">Alarms notify this device</span>;
  return (
    <button
      type="button"
      disabled={permission === 'denied'}
      onClick={() => void requestNotifications().then(setPermission)}
      className="inline-flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold hover:border-accent disabled:opacity-50"
      title={permission === 'denied' ? 'Notifications are blocked in this browser’s settings' : undefined}
    >
      Notify me on this device
    </button>
  );
}
