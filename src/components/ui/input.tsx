import type { InputHTMLAttributes, Ref, SelectHTMLAttributes, TextareaHTMLAttributes } from 'react';
import { cx } from '@/lib/cx';

const control =
  'block w-full rounded-md border bg-white px-3 text-base text-ink-900 placeholder:text-ink-400 disabled:bg-ink-50 disabled:text-ink-400 aria-[invalid=true]:border-red-700 aria-[invalid=true]:ring-1 aria-[invalid=true]:ring-red-700';

export function Input({ className, ref, ...rest }: InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> }) {
  return <input ref={ref} className={cx(control, 'min-h-11 border-ink-300', className)} {...rest} />;
}

export function Select({ className, ref, ...rest }: SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> }) {
  return <select ref={ref} className={cx(control, 'min-h-11 border-ink-300 pr-8', className)} {...rest} />;
}

export function Textarea({ className, ref, ...rest }: TextareaHTMLAttributes<HTMLTextAreaElement> & { ref?: Ref<HTMLTextAreaElement> }) {
  return <textarea ref={ref} className={cx(control, 'min-h-24 border-ink-300 py-2', className)} {...rest} />;
}
