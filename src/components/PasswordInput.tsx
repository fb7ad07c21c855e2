import { useState, type InputHTMLAttributes, type Ref } from 'react';
import { Eye, EyeOff } from 'lucide-react';
import { inputClass } from './Field';

type Props = Omit<InputHTMLAttributes<HTMLInputElement>, 'type'> & { ref?: Ref<HTMLInputElement> };

/** A password input whose typing can be shown, so a new password can be checked by eye instead of
 * being typed twice. */
export function PasswordInput({ className = '', ...rest }: Props) {
  const [shown, setShown] = useState(false);
  return (
    <div className="relative">
      <input type={shown ? 'text' : 'password'} className={`${inputClass} w-full pr-9 ${className}`} {...rest} />
      <button
        type="button"
        className="absolute inset-y-0 right-0 flex items-center px-2 text-ink-muted hover:text-ink"
        aria-label={shown ? 'Hide password' : 'Show password'}
        aria-pressed={shown}
        onClick={() => setShown(!shown)}
      >
        {shown ? <EyeOff className="h-4 w-4" aria-hidden /> : <Eye className="h-4 w-4" aria-hidden />}
      </button>
    </div>
  );
}
