import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import { isRouteErrorResponse, Link, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import "./app.css";
import { Wordmark } from "./components/logo";

export const meta: Route.MetaFunction = () => [{ title: "Thermotally" }];

export const links: Route.LinksFunction = () => [
  { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" },
  { rel: "preload", href: "/fonts/noto-sans-latin-400-normal.woff2", as: "font", type: "font/woff2", crossOrigin: "anonymous" },
];

export function Layout({ children }: { children: React.ReactNode }) {
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen bg-paper text-ink antialiased">
        {children}
        <ScrollRestoration />
        <Scripts />
      </body>
    </html>
  );
}

export default function App() {
  const [queryClient] = useState(
    () => new QueryClient({ defaultOptions: { queries: { staleTime: 30_000, refetchOnWindowFocus: false } } }),
  );
  // Marks the document once React has taken over, so browser tests wait for interactivity, not just load.
  useEffect(() => {
    document.documentElement.dataset.hydrated = "true";
  }, []);
  return (
    <QueryClientProvider client={queryClient}>
      <Outlet />
    </QueryClientProvider>
  );
}

/** The app's own 404 and 500 pages: a plain explanation, never a stack trace. */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  let status = 500;
  let title = "Something went wrong";
  let message = "The server could not finish this request. The error has been logged; try again in a moment.";
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const detail = typeof error.data === "object" && error.data?.error?.message ? String(error.data.error.message) : null;
    if (status === 404) {
      title = "Page not found";
      message = detail ?? "There is nothing at this address, or you are not a member of the project it belongs to.";
    } else if (status === 403) {
      title = "Not allowed";
      message = detail ?? "Your role does not allow this.";
    } else if (status < 500) {
      title = "Request refused";
      message = detail ?? error.statusText;
    }
  } else if (import.meta.env.DEV && error instanceof Error) {
    console.error(error);
  }
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <Link to="/" className="mb-10 inline-block">
        <Wordmark />
      </Link>
      <p className="num text-sm font-medium text-copper">Error {status}</p>
      <h1 className="mt-1 text-2xl font-bold">{title}</h1>
      <p className="mt-3 text-muted">{message}</p>
      <p className="mt-8">
        <Link className="link" to="/projects">
          Back to your projects
        </Link>
      </p>
    </main>
  );
}
