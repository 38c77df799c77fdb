import type { ReactNode } from "react";
import { Link } from "react-router";
import { Wordmark } from "./logo";

/** The frame of the signed-out pages: the mark, a title and one narrow card. */
export function AuthShell({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center px-4 pt-16">
      <Link to="/" className="mb-8">
        <Wordmark />
      </Link>
      <div className="card w-full max-w-sm">
        <h1 className="mb-4 text-lg font-bold">{title}</h1>
        {children}
      </div>
      {footer ? <div className="mt-4 text-sm text-muted">{footer}</div> : null}
    </main>
  );
}
