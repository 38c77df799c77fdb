import { useRouteLoaderData } from "react-router";
import type { loader } from "~/routes/project-layout";

export type ProjectLayoutData = Awaited<ReturnType<typeof loader>>;

/** Child pages of a project read the project and what the viewer may do from the layout's loader. */
export function useProject(): ProjectLayoutData {
  const data = useRouteLoaderData<typeof loader>("project");
  if (!data) throw new Error("useProject outside a project page");
  return data as ProjectLayoutData;
}
