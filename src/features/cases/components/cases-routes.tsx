// The support desk's pages under /cases.
export function CasesRoutes() {
  return <h1 className="text-2xl font-semibold">Cases</h1>;
}

export function OutboxPage() {
  return <h1 className="text-2xl font-semibold">Outbox</h1>;
}
