import { api } from '../bridge.js';
import { href, type Route } from './route.js';
import { useLoad } from './use-load.js';

/** Where the page sits: section, household, scenario, each a link back up. */
export function Trail({ route }: { route: Route }) {
  const householdId = route.page === 'household' || route.page === 'scenario' ? route.householdId : undefined;
  const scenarioId = route.page === 'scenario' ? route.scenarioId : undefined;
  const household = useLoad(
    () => (householdId ? api['households.get']({ householdId }) : Promise.resolve(undefined)),
    [householdId],
  );
  const scenario = useLoad(
    () => (scenarioId ? api['scenarios.get']({ scenarioId }) : Promise.resolve(undefined)),
    [scenarioId],
  );
  if (route.page === 'households' || route.page === 'book' || route.page === 'library' || route.page === 'settings')
    return null;
  return (
    <nav className="trail" aria-label="You are here">
      {route.page === 'import' ? (
        <>
          <span>
            <a href={href({ page: 'library' })}>Price library</a>
          </span>
          <span>Import a price file</span>
        </>
      ) : (
        <>
          <span>
            <a href={href({ page: 'households' })}>Households</a>
          </span>
          {route.page === 'household-new' ? <span>New household</span> : null}
          {householdId ? (
            <span>
              {scenarioId ? (
                <a href={href({ page: 'household', householdId })}>{household.data?.name ?? 'Household'}</a>
              ) : (
                (household.data?.name ?? 'Household')
              )}
            </span>
          ) : null}
          {scenarioId ? <span>{scenario.data?.scenario.name ?? 'Scenario'}</span> : null}
        </>
      )}
    </nav>
  );
}
