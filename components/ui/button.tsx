import { forwardRef, type ButtonHTMLAttributes } from 'react';

const variants = {
  primary: 'bg-teal-600 text-white hover:bg-teal-700 disabled:bg-teal-300',
  secondary: 'border border-ink/15 bg-paper-raised text-ink hover:bg-paper-sunk disabled:text-ink-faint',
  danger: 'bg-danger-500 text-white hover:bg-danger-700 disabled:opacity-50',
  ghost: 'text-teal-700 hover:bg-teal-50',
} as const;

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & { variant?: keyof typeof variants; size?: 'sm' | 'md' };

export const buttonClass = (variant: keyof typeof variants = 'primary', size: 'sm' | 'md' = 'md') =>
  `inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed ${
    size === 'sm' ? 'px-2.5 py-1 text-sm' : 'px-4 py-2 text-sm'
  } ${variants[variant]}`;

export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button(
  { variant = 'primary', size = 'md', className = '', type = 'button', ...props },
  ref,
) {
  return <button ref={ref} type={type} className={`${buttonClass(variant, size)} ${className}`} {...props} />;
});
