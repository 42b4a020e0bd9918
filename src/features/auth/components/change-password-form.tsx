import { useForm } from 'react-hook-form';
import { PASSWORD_MIN_LENGTH } from '../../../../shared/schemas/user';
import { ApiError } from '../../../lib/api-client';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { useChangePassword } from '../api/change-password';

interface Values {
  currentPassword: string;
  newPassword: string;
  confirm: string;
}

/** Lets any signed-in user change their own password. */
export function ChangePasswordForm() {
  const change = useChangePassword();
  const {
    register,
    handleSubmit,
    reset,
    getValues,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ defaultValues: { currentPassword: '', newPassword: '', confirm: '' } });

  const onSubmit = handleSubmit(async ({ currentPassword, newPassword }) => {
    try {
      await change.mutateAsync({ currentPassword, newPassword });
      reset();
    } catch {
      // Shown from change.error.
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-md flex-col gap-4" aria-label="Change password">
      <TextField
        label="Current password"
        type="password"
        autoComplete="current-password"
        error={errors.currentPassword?.message ?? (change.error instanceof ApiError ? change.error.fields.currentPassword : undefined)}
        {...register('currentPassword', { required: 'Enter your current password.' })}
      />
      <TextField
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN_LENGTH} characters; a passphrase is best.`}
        error={errors.newPassword?.message}
        {...register('newPassword', {
          required: 'Choose a new password.',
          minLength: { value: PASSWORD_MIN_LENGTH, message: `Use at least ${PASSWORD_MIN_LENGTH} characters.` },
        })}
      />
      <TextField
        label="New password again"
        type="password"
        autoComplete="new-password"
        error={errors.confirm?.message}
        {...register('confirm', { validate: (v) => v === getValues('newPassword') || 'The two new passwords differ.' })}
      />
      {change.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff">
          {change.error instanceof Error ? change.error.message : 'Could not change the password.'}
        </p>
      )}
      {change.isSuccess && (
        <p role="status" className="text-sm font-medium text-state-recording">
          Password changed.
        </p>
      )}
      <Button type="submit" disabled={isSubmitting}>
        Change password
      </Button>
    </form>
  );
}
