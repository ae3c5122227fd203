import type { ReactNode } from "react";
import { ProductMark } from "./product-mark";

/** The quiet frame of the sign-in pages: mark, one card, a line about the product. */
export function AuthFrame({ title, children, demoMode }: { title: string; children: ReactNode; demoMode?: boolean }) {
  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-card focus:px-3 focus:py-2">
        Skip to main content
      </a>
      <header className="px-6 py-5">
        <ProductMark />
      </header>
      <main id="main" className="flex flex-1 items-start justify-center px-4 pt-8 pb-16">
        <div className="w-full max-w-md rounded-lg border border-rule bg-card p-8 shadow-sm">
          <h1 className="mb-4 text-2xl font-semibold">{title}</h1>
          {children}
        </div>
      </main>
      <footer className="px-6 pb-6 text-sm text-muted">
        Competencies, bedside check-offs and credentials for respiratory care.
        {demoMode ? (
          <>
            {" "}
            Demo mode: sign-in codes arrive in the <a href="/dev/outbox">demo outbox</a>.
          </>
        ) : null}
      </footer>
    </div>
  );
}
