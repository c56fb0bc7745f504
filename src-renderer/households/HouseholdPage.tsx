import { useState } from 'react';
import { api } from '../bridge.js';
import { formatInstant } from '../../shared-core/present/format.js';
import { ErrorNote, Loading } from '../app/notes.js';
import { useLoad } from '../app/use-load.js';
import { HoldingsPanel } from './HoldingsPanel.js';
import { HouseholdForm } from './HouseholdForm.js';
import { ScenariosPanel } from './ScenariosPanel.js';
import { hasMandate } from '../../shared-core/scenario/household-mandate.js';
import { mandateInWords } from './starter-scenario.js';

/** One household: who they are, what they hold now, and the scenarios built for them. */
export function HouseholdPage({ householdId }: { householdId: string }) {
  const household = useLoad(() => api['households.get']({ householdId }), [householdId]);
  const [editing, setEditing] = useState(false);

  if (household.error) return <ErrorNote title="This household cannot be shown" error={household.error} />;
  if (!household.data) return <Loading what="the household" />;
  const h = household.data;

  return (
    <>
      <div className="page-head">
        <div>
          <h1>{h.name}</h1>
          <p className="muted">
            {h.reference ? `Reference ${h.reference} · ` : ''}base currency{' '}
            <span className="code">{h.baseCurrency}</span>
            {h.updatedAt ? ` · last changed ${formatInstant(h.updatedAt)}` : ''}
          </p>
          <p className="muted" data-testid="household-mandate">
            {hasMandate(h.mandate)
              ? `Mandate: ${mandateInWords(h.mandate)}.`
              : 'No mandate on file: a new scenario starts from stated defaults (edit the details to set one).'}
          </p>
        </div>
        {!editing ? (
          <button type="button" onClick={() => setEditing(true)}>
            Edit details
          </button>
        ) : null}
      </div>
      {editing ? (
        <section className="section" aria-label="Edit the household">
          <HouseholdForm
            initial={{
              name: h.name,
              baseCurrency: h.baseCurrency,
              reference: h.reference,
              notes: h.notes,
              mandate: h.mandate,
            }}
            submitLabel="Save details"
            onSubmit={async (fields) => {
              await api['households.update']({ householdId, fields });
              setEditing(false);
              household.reload();
            }}
            onCancel={() => setEditing(false)}
          />
        </section>
      ) : h.notes ? (
        <p className="sheet" style={{ whiteSpace: 'pre-wrap' }}>
          {h.notes}
        </p>
      ) : null}
      <HoldingsPanel householdId={householdId} onChanged={household.reload} />
      <ScenariosPanel household={h} />
    </>
  );
}
