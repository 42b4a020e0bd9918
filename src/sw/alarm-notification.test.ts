import { describe, expect, it, vi } from 'vitest';
import { ACK_ACTION, alarmNotification, onAlarmNotificationClick, shownNotices, type ClickDeps } from './alarm-notification';

// A push as the server's push channel writes it (server/push/push-payload.ts); demo names.
const push = {
  alarmId: 7, step: 0, kind: 'cutoff', priority: 'critical', title: 'CRITICAL cutoff: Bench 3', body: 'End voltage reached\nBench 3, Northgate Cells N-7',
  bench: 'Bench 3', pack: 'Northgate Cells N-7', run: 'Capacity (#12)', values: [['Voltage', '10.000 V']],
  runUrl: 'https://lab.example/runs/12', ackUrl: 'https://lab.example/alarms/7', ackApiUrl: 'https://lab.example/api/push/acknowledge', ackToken: '2.1700000000000.sig',
};

function deps(answer: { ok: boolean; status: number } | Error) {
  return {
    fetch: vi.fn<ClickDeps['fetch']>(() => (answer instanceof Error ? Promise.reject(answer) : Promise.resolve(answer))),
    openWindow: vi.fn<ClickDeps['openWindow']>(() => Promise.resolve(null)),
    notify: vi.fn<ClickDeps['notify']>(() => Promise.resolve()),
  };
}

describe('alarm service worker', () => {
  it('shows a critical alarm push as a lasting notification, one per alarm, with Acknowledge and Open', () => {
    const n = alarmNotification(JSON.stringify(push));
    expect(n.title).toBe(push.title);
    expect(n.options).toMatchObject({ body: push.body, tag: 'alarm-7', requireInteraction: true, renotify: false });
    expect(n.options.actions.map((a) => a.title)).toEqual(['Acknowledge', 'Open the run']);
    expect(n.options.data).toEqual({ alarmId: 7, step: 0, runUrl: push.runUrl, ackApiUrl: push.ackApiUrl, ackToken: push.ackToken });
  });

  it('a repeated push (the server sends at least once) replaces the notice quietly; a reminder alerts again', () => {
    const first = alarmNotification(JSON.stringify(push));
    const onScreen = shownNotices([{ data: first.options.data }, { data: 'something else' }, {}]);
    expect(onScreen).toEqual([{ step: 0, acknowledged: false }]);
    const repeat = alarmNotification(JSON.stringify(push), onScreen);
    expect(repeat.options).toMatchObject({ tag: 'alarm-7', renotify: false });
    const reminder = alarmNotification(JSON.stringify({ ...push, step: 1 }), onScreen);
    expect(reminder.options).toMatchObject({ tag: 'alarm-7', renotify: true });
    // The first notice arriving late after the reminder does not alert either.
    expect(alarmNotification(JSON.stringify(push), [{ step: 1, acknowledged: false }]).options.renotify).toBe(false);
  });

  it('after Acknowledge worked here, a repeat of the alarm keeps the quiet "acknowledged" notice', async () => {
    const d = deps({ ok: true, status: 200 });
    await onAlarmNotificationClick(ACK_ACTION, alarmNotification(JSON.stringify(push)).options.data, d);
    const acked = d.notify.mock.calls[0]![0];
    const again = alarmNotification(JSON.stringify({ ...push, step: 1 }), shownNotices([{ data: acked.options.data }]));
    expect(again.title).toBe('Alarm acknowledged');
    expect(again.options).toMatchObject({ tag: 'alarm-7', renotify: false, requireInteraction: false, actions: [] });
    // A click on it opens the run and posts nothing.
    const click = deps({ ok: true, status: 200 });
    await onAlarmNotificationClick(ACK_ACTION, again.options.data, click);
    expect(click.fetch).not.toHaveBeenCalled();
    expect(click.openWindow).toHaveBeenCalledWith(push.runUrl);
  });

  it('still shows a notice for a push it cannot read (the browser requires one per push)', () => {
    expect(alarmNotification('not json').title).toBe('Kneepoint alarm');
    expect(alarmNotification(JSON.stringify({ ...push, ackToken: 5 })).options.data).toBeNull();
    expect(alarmNotification(JSON.stringify({ ...push, step: undefined })).options.data).toBeNull();
  });

  it('Acknowledge posts the token without cookies and says it is done', async () => {
    const d = deps({ ok: true, status: 200 });
    await onAlarmNotificationClick(ACK_ACTION, alarmNotification(JSON.stringify(push)).options.data, d);
    expect(d.fetch).toHaveBeenCalledWith(push.ackApiUrl, expect.objectContaining({ method: 'POST', credentials: 'omit' }));
    expect(JSON.parse(d.fetch.mock.calls[0]![1].body)).toEqual({ alarmId: 7, token: push.ackToken });
    expect(d.notify.mock.calls[0]![0].title).toBe('Alarm acknowledged');
    expect(d.openWindow).not.toHaveBeenCalled();
  });

  it('a refused or failed Acknowledge says so and opens the run to acknowledge there', async () => {
    for (const answer of [{ ok: false, status: 403 }, new Error('offline')]) {
      const d = deps(answer);
      await onAlarmNotificationClick(ACK_ACTION, alarmNotification(JSON.stringify(push)).options.data, d);
      expect(d.notify.mock.calls[0]![0].title).toBe('Not acknowledged');
      expect(d.openWindow).toHaveBeenCalledWith(push.runUrl);
    }
  });

  it('a click on the notification itself opens the run and acknowledges nothing', async () => {
    const d = deps({ ok: true, status: 200 });
    await onAlarmNotificationClick('', alarmNotification(JSON.stringify(push)).options.data, d);
    expect(d.openWindow).toHaveBeenCalledWith(push.runUrl);
    expect(d.fetch).not.toHaveBeenCalled();
  });
});
