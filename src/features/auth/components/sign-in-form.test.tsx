import { screen, waitFor } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { describe, expect, it, vi } from 'vitest';
import { meFixture, mockApi, renderWithApp } from '@/test/render';
import { SignInForm } from './sign-in-form';

function setup(handlers: Parameters<typeof mockApi>[0]) {
  const api = mockApi({ 'GET /api/me': () => ({ status: 401, body: { error: { code: 'unauthenticated', message: 'Sign in' } } }), ...handlers });
  const onSignedIn = vi.fn();
  renderWithApp(<SignInForm onSignedIn={onSignedIn} />);
  return { api, onSignedIn, user: userEvent.setup() };
}

describe('SignInForm', () => {
  it('shows an error beside each field when the form is sent empty, and sends nothing', async () => {
    const { api, user } = setup({});
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    const email = screen.getByLabelText('E-mail');
    const password = screen.getByLabelText('Password');
    await waitFor(() => expect(email.getAttribute('aria-invalid')).toBe('true'));
    expect(password.getAttribute('aria-invalid')).toBe('true');
    expect(document.getElementById(email.getAttribute('aria-describedby') ?? '')?.textContent).toContain(
      'Enter an e-mail address',
    );
    expect(document.getElementById(password.getAttribute('aria-describedby') ?? '')?.textContent).toContain(
      'Fill in this field.',
    );
    expect(api.calls.filter((c) => c.url.includes('/api/auth/login'))).toHaveLength(0);
  });

  it("shows the server's answer when the e-mail and password don't match", async () => {
    const { api, user, onSignedIn } = setup({
      'POST /api/auth/login': () => ({ status: 401, body: { error: { code: 'invalid_credentials', message: 'Invalid e-mail or password' } } }),
    });
    await user.type(screen.getByLabelText('E-mail'), 'hand@harrowbend.example');
    await user.type(screen.getByLabelText('Password'), 'not-the-password{Enter}');

    const alert = await screen.findByRole('alert');
    expect(alert.textContent).toContain("That e-mail and password don't match");
    expect(onSignedIn).not.toHaveBeenCalled();
    const login = api.calls.find((c) => c.url.endsWith('/api/auth/login'));
    expect(login?.body).toEqual({ email: 'hand@harrowbend.example', password: 'not-the-password' });
    expect(login?.headers['x-gillwise-client']).toBe('web');
    expect(login?.credentials).toBe('same-origin');
  });

  it("puts the server's field errors beside the fields", async () => {
    const { user } = setup({
      'POST /api/auth/login': () => ({
        status: 400,
        body: { error: { code: 'validation_failed', message: 'Invalid body', details: { fieldErrors: { email: ['Unknown domain'] } } } },
      }),
    });
    await user.type(screen.getByLabelText('E-mail'), 'hand@harrowbend.example');
    await user.type(screen.getByLabelText('Password'), 'whatever{Enter}');
    const email = screen.getByLabelText('E-mail');
    await waitFor(() => expect(email.getAttribute('aria-invalid')).toBe('true'));
    expect(document.getElementById(email.getAttribute('aria-describedby') ?? '')?.textContent).toContain('Unknown domain');
  });

  it('tells the user when they are rate-limited', async () => {
    const { user } = setup({
      'POST /api/auth/login': () => ({ status: 429, body: { error: { code: 'rate_limited', message: 'Too many requests' } } }),
    });
    await user.type(screen.getByLabelText('E-mail'), 'hand@harrowbend.example');
    await user.type(screen.getByLabelText('Password'), 'whatever{Enter}');
    expect((await screen.findByRole('alert')).textContent).toContain('Too many attempts');
  });

  it('hands the signed-in user over on success', async () => {
    const me = meFixture('manager');
    const { user, onSignedIn } = setup({ 'POST /api/auth/login': () => ({ status: 200, body: me }) });
    await user.type(screen.getByLabelText('E-mail'), 'manager@harrowbend.example');
    await user.type(screen.getByLabelText('Password'), 'gillwise-demo');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));
    await waitFor(() => expect(onSignedIn).toHaveBeenCalledWith(me));
  });
});
