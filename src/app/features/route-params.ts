/**
 * Names the route inputs an effect reloads on: `routeKey(this.teamId(), this.designId())`
 * reads them (so the effect runs again when the router reuses the page for other
 * parameters) and returns them joined. Pages whose loading is not yet a
 * resource use it; a resource's `params` does the same job.
 */
export function routeKey(...params: readonly (string | undefined)[]): string {
  return params.join('/');
}
