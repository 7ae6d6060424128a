import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'danger' | 'ghost';
type Size = 'sm' | 'md';

const VARIANT: Record<Variant, string> = {
  primary: 'bg-accent text-white border-accent hover:bg-accent-strong hover:border-accent-strong',
  secondary: 'bg-panel text-ink border-rule-strong hover:bg-sunken',
  danger: 'bg-panel text-danger border-danger hover:bg-danger-soft',
  ghost: 'bg-transparent text-accent border-transparent hover:bg-accent-soft',
};

const SIZE: Record<Size, string> = {
  sm: 'h-7 px-2 text-[13px]',
  md: 'h-8 px-3 text-sm',
};

/** Class string for something that should look like a button (also used on router Links). */
export function buttonClass(variant: Variant = 'secondary', size: Size = 'md'): string {
  return `inline-flex items-center justify-center gap-1.5 rounded-[3px] border font-semibold whitespace-nowrap transition-colors disabled:cursor-not-allowed disabled:opacity-50 ${VARIANT[variant]} ${SIZE[size]}`;
}

interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: Variant;
  size?: Size;
  /** Shows the busy text and disables the button while a request runs. */
  busy?: boolean;
  busyText?: string;
}

export function Button({ variant = 'secondary', size = 'md', busy, busyText, className = '', type = 'button', disabled, children, ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      className={`${buttonClass(variant, size)} ${className}`}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      {...rest}
    >
      {busy && busyText ? busyText : children}
    </button>
  );
}
