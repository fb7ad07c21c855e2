import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, Navigate, useNavigate, useSearchParams } from 'react-router-dom';
import { loginSchema, type LoginInput } from '@shared/schemas/auth';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useSession, useSignIn } from '@/lib/session';
import { AuthFrame } from '../components/AuthFrame';

export function SignInPage() {
  const session = useSession();
  const signIn = useSignIn();
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const next = params.get('next')?.startsWith('/') ? params.get('next')! : '/';
  const form = useForm<LoginInput>({ resolver: zodResolver(loginSchema), defaultValues: { email: '', password: '' } });

  if (session.data) return <Navigate to={next} replace />;

  const submit = form.handleSubmit((values) => signIn.mutate(values, { onSuccess: () => navigate(next, { replace: true }) }));

  return (
    <AuthFrame>
      <form onSubmit={submit} noValidate className="space-y-4" aria-label="Sign in">
        <div>
          <h1>Sign in</h1>
          <p className="text-sm text-ink-muted">Use your Phaselot account.</p>
        </div>
        {signIn.error && <Notice tone="error">{signIn.error.message}</Notice>}
        <Field label="E-mail" htmlFor="email" error={form.formState.errors.email?.message}>
          <input id="email" type="email" autoComplete="username" className={inputClass} {...form.register('email')} />
        </Field>
        <Field label="Password" htmlFor="password" error={form.formState.errors.password?.message}>
          <input id="password" type="password" autoComplete="current-password" className={inputClass} {...form.register('password')} />
        </Field>
        <Button type="submit" className="w-full justify-center" disabled={signIn.isPending}>
          {signIn.isPending ? 'Signing in…' : 'Sign in'}
        </Button>
        <p className="text-center text-sm">
          <Link to="/forgot-password">Forgot your password?</Link>
        </p>
      </form>
    </AuthFrame>
  );
}
