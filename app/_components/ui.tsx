/**
 * The small set of building blocks every screen uses. Copper is for actions only; the state
 * colours (pass / warning / fail) are for checks only and always come with a word.
 */
import Link from "next/link";
import type { ButtonHTMLAttributes, InputHTMLAttributes, ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";

function cx(...parts: Array<string | false | null | undefined>): string {
  return parts.filter(Boolean).join(" ");
}

type Variant = "primary" | "secondary" | "quiet" | "danger";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-copper text-white hover:bg-copper-strong border border-copper-strong/40 shadow-[0_1px_0_rgb(0_0_0/0.08)]",
  secondary: "bg-sheet text-ink border border-rule-strong hover:border-ink-3",
  quiet: "bg-transparent text-ink-2 hover:text-ink hover:bg-ink/5 border border-transparent",
  danger: "bg-sheet text-fail border border-fail/40 hover:bg-fail-wash",
};

export function buttonClass(variant: Variant = "secondary", size: "sm" | "md" = "md"): string {
  return cx(
    "inline-flex items-center justify-center gap-1.5 rounded-md font-medium transition-colors disabled:opacity-50 disabled:pointer-events-none",
    size === "sm" ? "h-7 px-2.5 text-[13px]" : "h-9 px-3.5 text-sm",
    VARIANTS[variant],
  );
}

export function Button({ variant = "secondary", size = "md", className, ...rest }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: "sm" | "md" }) {
  return <button className={cx(buttonClass(variant, size), className)} {...rest} />;
}

export function LinkButton({ href, variant = "secondary", size = "md", children, className }: { href: string; variant?: Variant; size?: "sm" | "md"; children: ReactNode; className?: string }) {
  return (
    <Link href={href} className={cx(buttonClass(variant, size), className)}>
      {children}
    </Link>
  );
}

const inputBase =
  "w-full rounded-md border bg-white/80 px-2.5 text-sm text-ink placeholder:text-ink-3 focus:border-copper focus:outline-none focus:ring-2 focus:ring-copper/20 aria-[invalid=true]:border-fail";

export function TextInput({ className, ...rest }: InputHTMLAttributes<HTMLInputElement>) {
  return <input className={cx(inputBase, "h-9 border-rule-strong", className)} {...rest} />;
}

export function TextArea({ className, ...rest }: TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return <textarea className={cx(inputBase, "border-rule-strong py-2", className)} {...rest} />;
}

export function Select({ className, children, ...rest }: SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <select className={cx(inputBase, "h-9 border-rule-strong pr-7", className)} {...rest}>
      {children}
    </select>
  );
}

/** A labelled form field with its error message (announced to screen readers). */
export function Field({ label, htmlFor, error, hint, children, className }: { label: string; htmlFor: string; error?: string; hint?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <div className={cx("flex flex-col gap-1", className)}>
      <label htmlFor={htmlFor} className="text-[13px] font-medium text-ink-2">
        {label}
      </label>
      {children}
      {error ? (
        <p id={`${htmlFor}-error`} role="alert" className="text-[12.5px] text-fail">
          {error}
        </p>
      ) : hint ? (
        <p className="text-[12.5px] text-ink-3">{hint}</p>
      ) : null}
    </div>
  );
}

export function Panel({ title, actions, children, className }: { title?: ReactNode; actions?: ReactNode; children: ReactNode; className?: string }) {
  return (
    <section className={cx("rounded-lg border border-rule bg-sheet", className)}>
      {title || actions ? (
        <header className="flex items-center justify-between gap-3 border-b border-rule px-4 py-2.5">
          <h2 className="text-[14px]">{title}</h2>
          {actions}
        </header>
      ) : null}
      <div className="p-4">{children}</div>
    </section>
  );
}

export function PageHeader({ title, eyebrow, actions, children }: { title: ReactNode; eyebrow?: ReactNode; actions?: ReactNode; children?: ReactNode }) {
  return (
    <div className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-rule pb-4">
      <div className="min-w-0">
        {eyebrow ? <div className="mb-1 text-[12px] uppercase tracking-[0.08em] text-ink-3">{eyebrow}</div> : null}
        <h1 className="truncate text-[22px] leading-tight">{title}</h1>
        {children ? <div className="mt-1 text-ink-2">{children}</div> : null}
      </div>
      {actions ? <div className="flex items-center gap-2">{actions}</div> : null}
    </div>
  );
}

/** A neutral tag, e.g. a role or a status. */
export function Tag({ children, tone = "neutral" }: { children: ReactNode; tone?: "neutral" | "copper" | "muted" }) {
  const tones = {
    neutral: "border-rule-strong text-ink-2 bg-white/60",
    copper: "border-copper/40 text-copper-strong bg-copper-wash",
    muted: "border-rule text-ink-3 bg-transparent",
  };
  return <span className={cx("inline-flex items-center rounded border px-1.5 py-px text-[12px] font-medium", tones[tone])}>{children}</span>;
}

/** A message box. `tone` "error" is for failures of an action, not for check results. */
export function Notice({ tone = "info", children, title }: { tone?: "info" | "error" | "warning" | "success"; title?: string; children: ReactNode }) {
  const tones = {
    info: "border-rule-strong bg-white/70 text-ink",
    error: "border-fail/40 bg-fail-wash text-ink",
    warning: "border-warn/40 bg-warn-wash text-ink",
    success: "border-pass/40 bg-pass-wash text-ink",
  };
  const words = { info: "Note", error: "Error", warning: "Attention", success: "Done" };
  return (
    <div role={tone === "error" ? "alert" : "status"} className={cx("rounded-md border px-3 py-2 text-[13.5px]", tones[tone])}>
      <span className="mr-1.5 font-semibold">{title ?? words[tone]}:</span>
      {children}
    </div>
  );
}

export function EmptyState({ title, children }: { title: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-rule-strong px-6 py-10 text-center">
      <p className="font-medium">{title}</p>
      {children ? <div className="mt-1 text-ink-2">{children}</div> : null}
    </div>
  );
}

export { cx };
