import { useForm } from 'react-hook-form';
import { ApiError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { useLogin, type LoginInput } from '../api/login';

const HTTP_UNAUTHORIZED = 401;
const HTTP_TOO_MANY = 429;
const EMAIL_PATTERN = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/** Turns a failed sign-in into words a person can act on. */
export function signInErrorMessage(error: unknown): string {
  if (error instanceof ApiError) {
    if (error.status === HTTP_TOO_MANY) return 'Too many sign-in attempts. Wait a few minutes, then try again.';
    if (error.status === HTTP_UNAUTHORIZED) return 'That e-mail and password do not match an account.';
    return error.message;
  }
  return 'The server could not be reached. Check the connection and try again.';
}

/** E-mail and password form; calls `onSignedIn` once the session exists. */
export function SignInForm({ onSignedIn }: { onSignedIn: () => void }) {
  const login = useLogin();
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<LoginInput>({ defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit(async (values) => {
    try {
      await login.mutateAsync({ email: values.email.trim(), password: values.password });
      onSignedIn();
    } catch {
      // The message is rendered from login.error below.
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Sign in">
      <TextField
        label="E-mail"
        type="email"
        autoComplete="username"
        autoFocus
        error={errors.email?.message}
        {...register('email', {
          required: 'Enter your e-mail address.',
          pattern: { value: EMAIL_PATTERN, message: 'That does not look like an e-mail address.' },
        })}
      />
      <TextField
        label="Password"
        type="password"
        autoComplete="current-password"
        error={errors.password?.message}
        {...register('password', { required: 'Enter your password.' })}
      />
      {login.isError && (
        <p role="alert" className="rounded-lg border border-state-cutoff/60 bg-state-cutoff/10 p-3 text-sm font-medium text-ink">
          {signInErrorMessage(login.error)}
        </p>
      )}
      <Button type="submit" size="lg" disabled={isSubmitting}>
        {isSubmitting ? 'Signing in…' : 'Sign in'}
      </Button>
    </form>
  );
}
