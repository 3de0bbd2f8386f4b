import { ActivatedRoute } from '@angular/router';

/** A path parameter of this route or any parent (`teamId` is set two levels up). */
export function routeParam(route: ActivatedRoute, name: string): string {
  for (let r: ActivatedRoute | null = route; r; r = r.parent) {
    const v = r.snapshot.paramMap.get(name);
    if (v !== null) return v;
  }
  return '';
}
