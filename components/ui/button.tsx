import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';

const styles: Record<Variant, string> = {
  primary: 'bg-fir-700 text-white hover:bg-fir-800 not-data-waiting:disabled:bg-stone-400',
  secondary:
    'border border-stone-300 bg-white text-stone-900 hover:bg-stone-100 not-data-waiting:disabled:text-stone-400',
  danger: 'bg-danger-600 text-white hover:bg-danger-700 not-data-waiting:disabled:bg-stone-400',
  ghost: 'text-fir-700 hover:bg-fir-50',
};

/**
 * Buttons are at least 44 px tall so they can be tapped with a glove at the tank. A button disabled
 * only while the page's script loads (`data-waiting`, see SubmitButton) keeps its colours, so it
 * does not flash grey on every page load.
 */
export function Button({
  variant = 'primary',
  className = '',
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return (
    <button
      {...props}
      className={`inline-flex min-h-11 items-center justify-center gap-2 rounded-lg px-4 py-2 text-sm font-semibold transition-colors not-data-waiting:disabled:cursor-not-allowed ${styles[variant]} ${className}`}
    />
  );
}
