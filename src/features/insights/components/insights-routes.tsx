// The manager's insights pages under /insights.
export function InsightsRoutes() {
  return <h1 className="text-2xl font-semibold">Insights</h1>;
}
