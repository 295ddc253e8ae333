// Sites, lines and applicators: the pages under /applicators.
export function AssetsRoutes() {
  return <h1 className="text-2xl font-semibold">Applicators</h1>;
}
