import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Navigate, useNavigate, useSearchParams } from 'react-router';
import { loginSchema, type LoginInput } from '@shared/schemas/auth';
import { BrandMark } from '@/components/BrandMark';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { useSession, useSignIn } from '../api/session';

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
    <div className="grid min-h-screen md:grid-cols-[minmax(0,5fr)_minmax(0,4fr)]">
      <section className="hidden flex-col justify-between bg-frame p-10 text-white md:flex">
        <BrandMark />
        <div className="max-w-md">
          <p className="text-2xl leading-snug font-semibold">Every wave plate checked against its order before it goes into an instrument.</p>
          <p className="mt-3 text-sm text-white/70">Receiving, quarantine, polarimetric inspection, signed dispositions and serial traceability for retarder lots.</p>
        </div>
        <p className="text-xs text-white/50">Lot decisions remain the responsibility of your site's quality system and its procedures.</p>
      </section>
      <section className="flex items-center justify-center p-6">
        <form onSubmit={submit} noValidate className="w-full max-w-xs space-y-4" aria-label="Sign in">
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
        </form>
      </section>
    </div>
  );
}
