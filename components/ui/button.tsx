import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "quiet";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-accent text-white hover:bg-accent-strong disabled:bg-ink-muted",
  secondary: "border-2 border-accent bg-paper-raised text-accent-strong hover:bg-accent-soft",
  quiet: "text-ink-soft underline-offset-4 hover:underline",
};

/** Every action is at least 44 px tall: technicians tap with gloves on. */
export function buttonClasses(variant: Variant = "primary", extra = ""): string {
  return `inline-flex min-h-touch items-center justify-center gap-2 rounded-card px-5 text-base font-semibold transition-colors disabled:cursor-not-allowed ${VARIANTS[variant]} ${extra}`;
}

export function Button({ variant = "primary", className = "", ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button className={buttonClasses(variant, className)} {...props} />;
}
