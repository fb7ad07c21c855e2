import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { PASSWORD_HINT } from '@shared/schemas/password';
import { userCreateSchema, type UserCreateInput } from '@shared/schemas/users';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useCreateUser } from '../api';
import { RolePicker } from './RolePicker';

export function NewUserForm({ onDone }: { onDone: () => void }) {
  const create = useCreateUser();
  const form = useForm<UserCreateInput>({ resolver: zodResolver(userCreateSchema), defaultValues: { email: '', name: '', password: '', roles: [] } });
  const errors = form.formState.errors;
  const submit = form.handleSubmit((values) => create.mutate(values, { onSuccess: onDone }));
  return (
    <form onSubmit={submit} noValidate aria-label="New user" className="mb-4 space-y-3 rounded border border-paper-line bg-paper-card p-4">
      {create.error && <Notice tone="error">{create.error.message}</Notice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Name" htmlFor="new-name" error={errors.name?.message}>
          <input id="new-name" className={inputClass} {...form.register('name')} />
        </Field>
        <Field label="E-mail" htmlFor="new-email" error={errors.email?.message}>
          <input id="new-email" type="email" className={inputClass} {...form.register('email')} />
        </Field>
        <Field label="Initial password" htmlFor="new-password" error={errors.password?.message} hint={`${PASSWORD_HINT} The user can change it later.`}>
          <input id="new-password" type="password" autoComplete="new-password" className={inputClass} {...form.register('password')} />
        </Field>
      </div>
      <Field label="Roles" error={errors.roles?.message}>
        <Controller
          control={form.control}
          name="roles"
          render={({ field }) => <RolePicker idPrefix="new-role" value={field.value} onChange={field.onChange} />}
        />
      </Field>
      <div className="flex gap-2">
        <Button type="submit" disabled={create.isPending}>
          Create user
        </Button>
        <Button look="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
