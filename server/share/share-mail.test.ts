import { describe, expect, it } from 'vitest';
import { SECRET_PLACEHOLDER } from '../mail/mail-queue.js';
import { buildShareMail } from './share-mail.js';

const input = {
  labName: 'Northgate Cell Lab', senderName: 'Ada Tech', what: 'run Capacity 7', message: undefined,
  publicUrl: 'https://lab.example', expires: '2027-01-01 10:00 (Europe/Berlin)',
};

describe('the share link e-mail', () => {
  it('links to the shared page with the token left as a placeholder, in text and HTML', () => {
    const mail = buildShareMail(input);
    expect(mail.subject).toBe('[Northgate Cell Lab] Ada Tech shared a report with you: run Capacity 7');
    expect(mail.text).toContain(`https://lab.example/s/${SECRET_PLACEHOLDER}`);
    expect(mail.html).toContain(`href="https://lab.example/s/${SECRET_PLACEHOLDER}"`);
    expect(mail.text).toContain('2027-01-01 10:00 (Europe/Berlin)');
  });

  it('keeps line breaks out of the subject and markup out of the HTML', () => {
    const mail = buildShareMail({ ...input, what: 'run A\r\nBcc: someone@example.com', message: 'Hi <b>Bob</b>,\r\nsee the cutoff & recovery.' });
    expect(mail.subject).not.toMatch(/[\r\n]/);
    expect(mail.subject).toContain('run A Bcc: someone@example.com');
    expect(mail.text).toContain('> Hi <b>Bob</b>,\n> see the cutoff & recovery.');
    expect(mail.html).toContain('<blockquote>Hi &lt;b&gt;Bob&lt;/b&gt;,<br>see the cutoff &amp; recovery.</blockquote>');
  });
});
