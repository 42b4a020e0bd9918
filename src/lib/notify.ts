/** True when this browser can show system notifications at all. */
export function notificationsSupported(): boolean {
  return typeof window !== 'undefined' && 'Notification' in window;
}

/** Current permission, or 'unsupported'. */
export function notificationPermission(): NotificationPermission | 'unsupported' {
  return notificationsSupported() ? Notification.permission : 'unsupported';
}

/** Asks once, from a click, so an alarm can reach a technician who is in another tab or app. */
export async function requestNotifications(): Promise<NotificationPermission | 'unsupported'> {
  if (!notificationsSupported()) return 'unsupported';
  return Notification.requestPermission();
}

/** Shows a system notification when allowed; `tag` keeps one notification per alarm. */
export function notify(title: string, body: string, tag: string): void {
  if (notificationPermission() !== 'granted') return;
  try {
    new Notification(title, { body, tag, requireInteraction: true });
  } catch {
    // Some mobile browsers only notify through a service worker; the banner and tone remain.
  }
}
