import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { siteSettingsSchema, type SiteSettings, type SiteSettingsInput } from '@shared/schemas/settings';
import { Button } from '@/components/Button';
import { Field, inputClass } from '@/components/Field';
import { Notice } from '@/components/Notice';
import { PageHeader } from '@/components/PageHeader';
import { useSaveSiteSettings, useSiteSettings } from '../api';

export function SiteSettingsPage() {
  const settings = useSiteSettings();
  const save = useSaveSiteSettings();
  const form = useForm<SiteSettingsInput, unknown, SiteSettings>({ resolver: zodResolver(siteSettingsSchema) });
  useEffect(() => {
    if (settings.data) form.reset(settings.data);
  }, [settings.data, form]);
  const submit = form.handleSubmit((values) => save.mutate(values));
  return (
    <div className="max-w-xl">
      <PageHeader title="Site settings" />
      <form onSubmit={submit} noValidate aria-label="Site settings" className="space-y-4 rounded border border-paper-line bg-paper-card p-4">
        {save.error && <Notice tone="error">{save.error.message}</Notice>}
        {save.isSuccess && <Notice tone="info">Saved.</Notice>}
        <Field label="Site name (printed on certificates)" htmlFor="site-name" error={form.formState.errors.siteName?.message}>
          <input id="site-name" className={inputClass} {...form.register('siteName')} />
        </Field>
        <label className="flex items-start gap-2 text-sm">
          <input type="checkbox" className="mt-1" {...form.register('reducedInspectionEnabled')} />
          <span>
            Allow reduced inspection
            <span className="block text-xs text-ink-muted">
              When on, a supplier and part whose switching score reaches 30 on normal inspection move to reduced inspection (ISO 2859-1, 9.3.3).
            </span>
          </span>
        </label>
        <Field
          label="Calibration reminders (days before the due date)"
          htmlFor="calibration-reminders"
          hint="Quality managers are mailed once at each, for example 30, 7"
          error={form.formState.errors.calibrationReminderDays?.message}
        >
          <input id="calibration-reminders" inputMode="numeric" className={inputClass} {...form.register('calibrationReminderDays')} />
        </Field>
        <Button type="submit" disabled={save.isPending}>
          Save settings
        </Button>
      </form>
    </div>
  );
}
