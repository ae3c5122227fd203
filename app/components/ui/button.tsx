import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "quiet" | "danger";

const variants: Record<Variant, string> = {
  primary: "bg-sea text-white hover:bg-sea-dark",
  secondary: "border border-sea bg-card text-sea hover:bg-sea-wash",
  quiet: "text-sea underline underline-offset-2 hover:bg-sea-wash",
  danger: "border border-coral bg-card text-coral hover:bg-coral-wash",
};

/** Buttons are at least 44 px tall so they work as touch targets at the bedside. */
export function buttonClass(variant: Variant = "primary", extra = "") {
  return `inline-flex min-h-11 items-center justify-center gap-2 rounded-md px-4 py-2 font-semibold disabled:opacity-60 ${variants[variant]} ${extra}`;
}

export function Button({ variant = "primary", className = "", type = "button", ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button type={type} {...props} className={buttonClass(variant, className)} />;
}
