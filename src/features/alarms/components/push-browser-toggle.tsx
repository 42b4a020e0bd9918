import { useEffect, useState } from 'react';
import { Button } from '../../../components/ui/button';
import {
  currentPushSubscription, PUSH_SUPPORT_MESSAGE, pushSupport, subscribeThisBrowser, thisBrowser, unsubscribeThisBrowser, type PushBrowser,
} from '../api/push-browser';

/**
 * "Notify this browser": subscribes this browser to alarm pushes (shown even with no tab
 * open), or says plainly why it cannot (not https, no Push API, notifications blocked).
 */
export function PushBrowserToggle({ browser = thisBrowser() }: { browser?: PushBrowser }) {
  const [subscribed, setSubscribed] = useState<boolean | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const support = pushSupport(browser);
  useEffect(() => {
    let live = true;
    currentPushSubscription(browser).then((s) => live && setSubscribed(s !== null), () => live && setSubscribed(false));
    return () => void (live = false);
  }, [browser]);

  const act = (work: () => Promise<string | null>) => {
    setBusy(true);
    work().then(setMessage, (err: unknown) => setMessage(err instanceof Error ? err.message : 'That did not work')).finally(() => setBusy(false));
  };
  const subscribe = () => act(async () => {
    const state = await subscribeThisBrowser(browser);
    if (state !== 'ready') return PUSH_SUPPORT_MESSAGE[state];
    setSubscribed(true);
    return 'This browser now gets alarm notifications, even with no Kneepoint tab open. Choose "Push to this browser" below for the alarms you want here.';
  });
  const unsubscribe = () => act(async () => {
    await unsubscribeThisBrowser(browser);
    setSubscribed(false);
    return 'This browser no longer gets alarm notifications.';
  });

  return (
    <div className="flex flex-col gap-2" data-testid="push-browser">
      <div className="flex flex-wrap items-center gap-3">
        {subscribed ? (
          <Button variant="secondary" onClick={unsubscribe} disabled={busy}>Stop notifying this browser</Button>
        ) : (
          <Button onClick={subscribe} disabled={busy || support === 'insecure' || support === 'unsupported'}>Notify this browser</Button>
        )}
      </div>
      {support !== 'ready' && !message && <p role="status" className="text-sm text-ink-muted">{PUSH_SUPPORT_MESSAGE[support]}</p>}
      {message && <p role="status" className="text-sm">{message}</p>}
    </div>
  );
}
