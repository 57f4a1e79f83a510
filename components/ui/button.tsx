import type { ButtonHTMLAttributes } from "react";

type Tone = "primary" | "plain" | "danger";

const tones: Record<Tone, string> = {
  primary: "bg-copper text-white hover:bg-copper-dark border-copper-dark",
  plain: "bg-sheet text-ink hover:bg-paper border-rule-strong",
  danger: "bg-danger text-white hover:opacity-90 border-danger",
};

export function buttonClass(tone: Tone = "plain"): string {
  return `inline-flex items-center justify-center gap-2 rounded-md border px-3.5 py-2 text-sm font-medium shadow-sm transition disabled:cursor-not-allowed disabled:opacity-50 ${tones[tone]}`;
}

export function Button({ tone = "plain", className = "", type = "button", ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { tone?: Tone }) {
  return <button type={type} className={`${buttonClass(tone)} ${className}`} {...props} />;
}
