import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AlarmDelivery } from './alarm-channel.js';
import { createSmtpTransport, emailChannel } from './email-channel.js';
import { FakeSmtpServer } from './fake-smtp.js';
import { BadAddressError, buildAlarmMail, headerSafe } from './mail-message.js';

const FROM = 'alarms@northgate.example';
const INJECTED = 'Pat\r\nBcc: thief@elsewhere.example\r\nX-Evil: 1';

/** A delivery of a cutoff alarm whose names carry header-injection attempts. */
function delivery(over: Partial<AlarmDelivery> = {}): AlarmDelivery {
  return {
    deliveryId: 7, step: 0,
    user: { id: 3, name: INJECTED, email: 'pat@northgate.example' },
    alarm: {
      id: 11, runId: 5, benchId: 2, kind: 'cutoff', priority: 'critical', state: 'unacknowledged',
      message: 'End voltage reached\r\nSubject: forged', elapsedSeconds: 1200,
      values: { volts: 12, amps: 10, dischargeWh: 42, dischargeAh: 10 / 3, tempCelsius: 25, runSeconds: 1200 },
      shelved: false, raisedAt: '2026-01-01T00:00:00.000Z', acknowledgedAt: null, acknowledgedBy: null, clearedAt: null, escalationStep: 0,
    },
    run: { id: 5, name: 'Capacity <b>7</b>' },
    bench: { id: 2, name: 'Bench 2\nBcc: thief@elsewhere.example' },
    pack: { label: 'Stack 7', brand: 'Voltara' },
    units: { temperatureUnit: 'F', energyUnit: 'Wh' },
    labName: 'Northgate Cell Lab',
    runUrl: 'http://lab.example/runs/5', ackUrl: 'http://lab.example/alarms/11', ackApiUrl: 'http://lab.example/api/alarms/11/acknowledge',
    ...over,
  };
}

describe('alarm mail', () => {
  it('headerSafe turns CR, LF and other controls into spaces', () => {
    expect(headerSafe('a\r\nBcc: x@y.example\u0000b\u2028c', 100)).toBe('a Bcc: x@y.example b c');
  });

  it('refuses a recipient or sender address that could carry a header', () => {
    expect(() => buildAlarmMail(delivery({ user: { id: 3, name: 'Pat', email: 'pat@northgate.example\r\nBcc: thief@elsewhere.example' } }), FROM)).toThrow(BadAddressError);
    expect(() => buildAlarmMail(delivery({ user: { id: 3, name: 'Pat', email: '"x"@northgate.example' } }), FROM)).toThrow(BadAddressError);
    expect(() => buildAlarmMail(delivery({ user: { id: 3, name: 'Pat', email: 'not an address' } }), FROM)).toThrow(BadAddressError);
    expect(() => buildAlarmMail(delivery(), 'alarms@x.example\nBcc: y@z.example')).toThrow(BadAddressError);
  });

  it('shows temperatures in the lab\'s unit and escapes names in the HTML', () => {
    const mail = buildAlarmMail(delivery(), FROM);
    // 25 °C = 77 °F (F = C × 9/5 + 32, NIST SP 811 conversion).
    expect(mail.text).toContain('77.0 °F');
    expect(mail.html).toContain('Capacity &lt;b&gt;7&lt;/b&gt;');
    expect(mail.html).not.toContain('<b>7</b>');
  });
});

describe('alarm mail over SMTP', () => {
  const smtp = new FakeSmtpServer();
  beforeAll(async () => void (await smtp.start()));
  afterAll(() => smtp.stop());

  it('never lets a name or note add a header or a recipient', async () => {
    const channel = emailChannel(createSmtpTransport({ url: smtp.url, requireTls: false, from: FROM }), FROM);
    await channel.deliver(delivery());
    expect(smtp.received).toHaveLength(1);
    const [mail] = smtp.received;
    expect(mail!.to).toEqual(['pat@northgate.example']);
    const head = mail!.raw.slice(0, mail!.raw.search(/\r?\n\r?\n/));
    const names = head.split(/\r?\n/).filter((l) => !/^[ \t]/.test(l)).map((l) => l.slice(0, l.indexOf(':')).toLowerCase());
    expect(names).not.toContain('bcc');
    expect(names).not.toContain('x-evil');
    expect(names.filter((n) => n === 'subject')).toHaveLength(1);
    expect(mail!.subject).toBe('[Northgate Cell Lab] CRITICAL cutoff: Bench 2 Bcc: thief@elsewhere.example, Voltara Stack 7');
    expect(head).toContain('Message-ID: <alarm-delivery-7@kneepoint.invalid>');
  });
});
