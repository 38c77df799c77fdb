import { AllCommunityModule, ModuleRegistry, themeQuartz } from "ag-grid-community";
import { AgGridReact, type AgGridReactProps } from "ag-grid-react";

/**
 * The AG Grid chunk: loaded lazily by LazyGrid, so the modules are registered once, when the first
 * grid of a session appears. Pages never import this file directly.
 */
ModuleRegistry.registerModules([AllCommunityModule]);

export const gridTheme = themeQuartz.withParams({
  fontFamily: "inherit",
  fontSize: 13,
  headerFontSize: 12,
  rowHeight: 30,
  headerHeight: 32,
  spacing: 5,
  accentColor: "#b4531c",
  foregroundColor: "#1f2430",
  borderColor: "#dcd7cc",
  headerBackgroundColor: "#f6f4ef",
  oddRowBackgroundColor: "#fbfaf7",
});

export default function GridImpl<T>(props: AgGridReactProps<T>) {
  return <AgGridReact<T> theme={gridTheme} {...props} />;
}
