/**
 * The page addresses of the app, kept in the fragment (`#/households/3`) so they work the same
 * from a file in the desktop window and from the local web host, and survive a reload.
 */
export type Route =
  | { page: 'households' }
  | { page: 'book' }
  | { page: 'household-new' }
  | { page: 'household'; householdId: string }
  | { page: 'scenario'; householdId: string; scenarioId: string }
  | { page: 'library'; universeId?: string; assetId?: string }
  | { page: 'import' }
  | { page: 'settings' };

export function parseRoute(hash: string): Route {
  const parts = hash
    .replace(/^#\/?/, '')
    .split('/')
    .filter(Boolean)
    .map((p) => decodeURIComponent(p));
  const [head, a, b, c] = parts;
  if (head === 'households') {
    if (a === 'new') return { page: 'household-new' };
    if (a && b === 'scenarios' && c) return { page: 'scenario', householdId: a, scenarioId: c };
    if (a) return { page: 'household', householdId: a };
    return { page: 'households' };
  }
  if (head === 'library') {
    if (a === 'import') return { page: 'import' };
    return { page: 'library', ...(a ? { universeId: a } : {}), ...(b ? { assetId: b } : {}) };
  }
  if (head === 'settings') return { page: 'settings' };
  if (head === 'review') return { page: 'book' };
  return { page: 'households' };
}

export function href(route: Route): string {
  const e = encodeURIComponent;
  switch (route.page) {
    case 'households':
      return '#/households';
    case 'book':
      return '#/review';
    case 'household-new':
      return '#/households/new';
    case 'household':
      return `#/households/${e(route.householdId)}`;
    case 'scenario':
      return `#/households/${e(route.householdId)}/scenarios/${e(route.scenarioId)}`;
    case 'library':
      return `#/library${route.universeId ? `/${e(route.universeId)}` : ''}${route.assetId ? `/${e(route.assetId)}` : ''}`;
    case 'import':
      return '#/library/import';
    case 'settings':
      return '#/settings';
  }
}

export function navigate(route: Route): void {
  window.location.hash = href(route);
}
