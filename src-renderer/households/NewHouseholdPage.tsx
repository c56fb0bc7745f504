import { api } from '../bridge.js';
import { navigate } from '../app/route.js';
import { HouseholdForm } from './HouseholdForm.js';

export function NewHouseholdPage() {
  return (
    <>
      <div className="page-head">
        <div>
          <h1>New household</h1>
          <p className="muted">The client's name and base currency; holdings and scenarios come next.</p>
        </div>
      </div>
      <HouseholdForm
        initial={{ name: '', baseCurrency: 'EUR', reference: '', notes: '' }}
        submitLabel="Create household"
        onSubmit={async (fields) => {
          const created = await api['households.create'](fields);
          navigate({ page: 'household', householdId: created.id });
        }}
        onCancel={() => navigate({ page: 'households' })}
      />
    </>
  );
}
