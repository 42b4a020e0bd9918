import { useForm } from 'react-hook-form';
import { PASSWORD_MIN_LENGTH, type CreateUserRequest, type Role } from '../../../../shared/schemas/user';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { ApiError } from '../../../lib/api-client';
import { useCreateUser } from '../api/users';
import { ROLE_OPTIONS } from './role-options';

/** Creates an account with a starting password the person changes later. */
export function UserForm({ onDone }: { onDone: () => void }) {
  const create = useCreateUser();
  const { register, handleSubmit, formState: { errors } } = useForm<CreateUserRequest>({
    defaultValues: { email: '', name: '', role: 'technician' as Role, password: '' },
  });
  const server = create.error instanceof ApiError ? create.error.fields : {};
  const onSubmit = handleSubmit((v) => create.mutate({ ...v, email: v.email.trim(), name: v.name.trim() }, { onSuccess: onDone }));
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Create a user" className="grid gap-4 md:grid-cols-2">
      <TextField label="Name" error={errors.name?.message ?? server.name} {...register('name', { required: 'Enter a name.' })} />
      <TextField label="E-mail" type="email" error={errors.email?.message ?? server.email} {...register('email', { required: 'Enter an e-mail address.' })} />
      <SelectField label="Role" options={ROLE_OPTIONS} {...register('role')} />
      <TextField
        label="Starting password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${PASSWORD_MIN_LENGTH} characters.`}
        error={errors.password?.message ?? server.password}
        {...register('password', { minLength: { value: PASSWORD_MIN_LENGTH, message: `At least ${PASSWORD_MIN_LENGTH} characters.` } })}
      />
      {create.isError && (
        <p role="alert" className="text-sm font-medium text-state-cutoff md:col-span-2">
          {create.error instanceof Error ? create.error.message : 'The user was not created.'}
        </p>
      )}
      <div className="flex gap-2 md:col-span-2">
        <Button type="submit" disabled={create.isPending}>
          Create user
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
