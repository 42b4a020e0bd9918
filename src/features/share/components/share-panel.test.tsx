import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { demoUser, stubApi } from '../../../testing/render-app';
import { SharePanel } from './share-panel';

const TOKEN = 'B'.repeat(43);
const LINK = {
  id: 4, kind: 'battery', targetId: 3, includePrices: false, recipient: null, createdByName: 'Northgate technician', createdAt: '2026-12-01T10:00:00.000Z',
  expiresAt: '2026-12-31T10:00:00.000Z', revokedAt: null, revokedByName: null, state: 'active', openings: 0,
};

afterEach(() => vi.unstubAllGlobals());

describe('share panel: send the link by e-mail', () => {
  it('sends the new link\'s token, the address and the note; shows the server\'s address error beside the field', async () => {
    let refuse = true;
    let made = false;
    let sent = false;
    const { calls } = stubApi(demoUser('technician'), (url, init) => {
      if (url === '/api/share-links' && init?.method === 'POST') {
        made = true;
        return { status: 201, body: { link: LINK, token: TOKEN, path: `/s/${TOKEN}` } };
      }
      if (url.startsWith('/api/share-links?')) return { status: 200, body: { links: made ? [LINK] : [] } };
      if (url === '/api/share-links/4/mails') {
        const mails = sent ? [{ id: 1, toAddress: 'buyer@client-firm.test', status: 'sent', attempts: 1, lastError: null, createdAt: 'T1', sentAt: 'T2' }] : [];
        return { status: 200, body: { mails } };
      }
      if (url === '/api/share-links/4/email') {
        if (refuse) return { status: 400, body: { error: { message: 'Invalid request: check the listed fields', fields: { to: ['an e-mail address such as client@example.com'] } } } };
        sent = true;
        return { status: 202, body: { queued: true, mailId: 1 } };
      }
      return undefined;
    });
    render(
      <QueryClientProvider client={new QueryClient({ defaultOptions: { queries: { retry: false } } })}>
        <SharePanel kind="battery" targetId={3} formatTime={(iso) => iso} />
      </QueryClientProvider>,
    );
    // No e-mail form before a link is made (the token exists only in the creating answer).
    expect(screen.queryByRole('form', { name: 'Send the link by e-mail' })).toBeNull();
    await userEvent.click(screen.getByRole('button', { name: 'Make link' }));
    const form = await screen.findByRole('form', { name: 'Send the link by e-mail' });
    const address = screen.getByLabelText("Client's e-mail address");
    await userEvent.type(address, 'buyer@client-firm.test');
    await userEvent.type(screen.getByLabelText('Message (optional)'), 'Hello,{enter}the report is ready.');
    await userEvent.click(screen.getByRole('button', { name: 'Send by e-mail' }));
    expect(await screen.findByText('an e-mail address such as client@example.com')).toBeTruthy();
    expect(form.contains(screen.getByText('an e-mail address such as client@example.com'))).toBe(true);
    refuse = false;
    await userEvent.click(screen.getByRole('button', { name: 'Send by e-mail' }));
    await waitFor(() => expect(screen.getByText(/Queued: the e-mail to buyer@client-firm.test goes out within seconds/)).toBeTruthy());
    const request = calls.filter((c) => c.url === '/api/share-links/4/email').at(-1)!;
    expect(JSON.parse(String(request.init!.body))).toEqual({ token: TOKEN, to: 'buyer@client-firm.test', message: 'Hello,\nthe report is ready.' });
    // The link's list says to whom it was e-mailed and that it went out.
    const mails = await screen.findByRole('list', { name: 'E-mails of this link' });
    expect(mails.textContent).toBe('E-mailed to buyer@client-firm.test T1: sent');
  });
});
