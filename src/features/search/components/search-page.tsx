// Search results page.
export function SearchPage() {
  return <h1 className="text-2xl font-semibold">Search</h1>;
}

export function SearchAdminPage() {
  return <h1 className="text-2xl font-semibold">Search engine</h1>;
}
