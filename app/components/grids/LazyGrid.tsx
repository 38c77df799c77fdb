import { lazy, Suspense, useEffect, useState, type ClipboardEvent, type ReactElement } from "react";
import type { AgGridReactProps } from "ag-grid-react";

// React.lazy loses the generic row type of the grid; the cast gives it back.
const GridImpl = lazy(() => import("./grid-impl")) as unknown as <T>(props: AgGridReactProps<T>) => ReactElement;

/**
 * An AG Grid rendered on the client only and loaded lazily (its chunk is large): the server and the
 * first client render show a placeholder of the same height, so nothing jumps on hydration.
 */
export function LazyGrid<T>({
  height,
  testId,
  onPaste,
  ...props
}: AgGridReactProps<T> & { height: number | string; testId?: string; onPaste?: (event: ClipboardEvent<HTMLDivElement>) => void }) {
  const [mounted, setMounted] = useState(false);
  useEffect(() => setMounted(true), []);
  const placeholder = (
    <div className="flex h-full items-center justify-center rounded-md border border-rule bg-panel text-sm text-muted" aria-busy="true">
      Loading the grid…
    </div>
  );
  return (
    <div style={{ height }} data-testid={testId} data-grid-ready={mounted ? "1" : "0"} onPaste={onPaste}>
      {mounted ? <Suspense fallback={placeholder}><GridImpl<T> {...(props as AgGridReactProps<T>)} /></Suspense> : placeholder}
    </div>
  );
}
