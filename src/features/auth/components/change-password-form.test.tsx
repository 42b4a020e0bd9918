import { screen } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it } from 'vitest';
import { demoUser, renderAt, stubApi } from '../../../testing/render-app';

describe('change own password', () => {
  it('catches a short or mistyped new password before sending it', async () => {
    const { calls } = stubApi(demoUser('viewer'));
    renderAt('/account');
    await userEvent.type(await screen.findByLabelText('Current password'), 'old-password-1');
    await userEvent.type(screen.getByLabelText('New password'), 'short');
    await userEvent.type(screen.getByLabelText('New password again'), 'different');
    await userEvent.click(screen.getByRole('button', { name: 'Change password' }));
    expect(await screen.findByText(/Use at least 10 characters/)).toBeTruthy();
    expect(screen.getByText('The two new passwords differ.')).toBeTruthy();
    expect(calls.some((c) => c.url === '/api/auth/password')).toBe(false);
  });

  it("shows the server's field error for a wrong current password", async () => {
    stubApi(demoUser('viewer'), (url) =>
      url === '/api/auth/password'
        ? { status: 400, body: { error: { message: 'The current password is wrong', fields: { currentPassword: ['wrong password'] } } } }
        : undefined,
    );
    renderAt('/account');
    await userEvent.type(await screen.findByLabelText('Current password'), 'not-my-password');
    await userEvent.type(screen.getByLabelText('New password'), 'a long new passphrase');
    await userEvent.type(screen.getByLabelText('New password again'), 'a long new passphrase');
    await userEvent.click(screen.getByRole('button', { name: 'Change password' }));
    expect(await screen.findByText('wrong password')).toBeTruthy();
    expect(screen.getByText('The current password is wrong')).toBeTruthy();
  });
});
