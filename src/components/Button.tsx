import type { ButtonHTMLAttributes } from 'react';

const looks = {
  primary: 'bg-frame text-white hover:bg-frame-deep disabled:bg-frame-soft',
  secondary: 'bg-paper-card text-ink border border-paper-line hover:bg-paper-sunk',
  danger: 'bg-state-fail text-white hover:brightness-90',
  quiet: 'text-frame hover:bg-paper-sunk',
} as const;

type Props = ButtonHTMLAttributes<HTMLButtonElement> & { look?: keyof typeof looks };

export function Button({ look = 'primary', className = '', type = 'button', ...rest }: Props) {
  return (
    <button
      type={type}
      className={`inline-flex items-center gap-1.5 rounded px-3 py-1.5 text-sm font-medium disabled:cursor-not-allowed disabled:opacity-60 ${looks[look]} ${className}`}
      {...rest}
    />
  );
}
