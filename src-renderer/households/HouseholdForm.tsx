import { useCallback, useId, useState, type FormEvent } from 'react';
import { householdFieldsSchema, type HouseholdFields } from '../../shared-core/contract/service-api.js';
import { NO_MANDATE, type HouseholdMandate } from '../../shared-core/scenario/household-mandate.js';
import { errorText } from '../app/notes.js';
import { PercentField } from '../scenario/brief/fields.js';

/** Currencies offered first; any ISO 4217 code can be typed. */
export const COMMON_CURRENCIES = ['EUR', 'USD', 'GBP', 'CHF', 'SEK', 'NOK', 'DKK', 'JPY', 'CAD', 'AUD', 'SGD', 'HKD'];

type FieldName = 'name' | 'baseCurrency' | 'reference' | 'notes' | 'mandate.assetCap' | 'mandate.illiquidMax';

/** The mandate's fields, labelled as the scenario's limits are (the messages use the same words). */
const MANDATE_FIELDS: readonly { key: keyof HouseholdMandate; label: string; hint: string }[] = [
  { key: 'assetCap', label: 'Cap per asset', hint: 'the most any one asset may weigh' },
  {
    key: 'illiquidMax',
    label: 'Cap on illiquid assets together',
    hint: 'assets with a lock-up or without daily dealing',
  },
];

/** Each field's reason, from the same schema the service checks with. */
function reasons(fields: HouseholdFields): Partial<Record<FieldName, string>> {
  const parsed = householdFieldsSchema.safeParse(fields);
  if (parsed.success) return {};
  const out: Partial<Record<FieldName, string>> = {};
  for (const issue of parsed.error.issues) {
    const key = issue.path.join('.') as FieldName;
    out[key] ??= issue.message;
  }
  return out;
}

export function HouseholdForm({
  initial,
  submitLabel,
  onSubmit,
  onCancel,
}: {
  initial: HouseholdFields;
  submitLabel: string;
  onSubmit: (fields: HouseholdFields) => Promise<void>;
  onCancel?: () => void;
}) {
  const [fields, setFields] = useState<HouseholdFields>(initial);
  const [touched, setTouched] = useState<Partial<Record<FieldName, boolean>>>({});
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<string>();
  const id = useId();
  // What a percent field holds that is not a number yet (it never reaches `fields`).
  const [typing, setTyping] = useState<Partial<Record<FieldName, string>>>({});
  const onTyping = useCallback(
    (path: string, message: string | null) => setTyping((t) => ({ ...t, [path]: message ?? undefined })),
    [],
  );
  const why = { ...reasons(fields), ...Object.fromEntries(Object.entries(typing).filter(([, m]) => m)) };
  const valid = Object.keys(why).length === 0;
  const mandate = fields.mandate ?? NO_MANDATE;
  const setLimit = (key: keyof HouseholdMandate, value: number | undefined) => {
    setFields((f) => ({ ...f, mandate: { ...NO_MANDATE, ...f.mandate, [key]: value ?? null } }));
    setTouched((t) => ({ ...t, [`mandate.${key}`]: true }));
  };
  const limitMessages = (key: FieldName) =>
    why[key] ? [{ path: key, message: why[key], source: typing[key] ? ('typing' as const) : ('schema' as const) }] : [];

  const set = (key: FieldName, value: string) => {
    setFields((f) => ({ ...f, [key]: key === 'baseCurrency' ? value.toUpperCase() : value }));
    setTouched((t) => ({ ...t, [key]: true }));
  };

  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setTouched({
      name: true,
      baseCurrency: true,
      reference: true,
      notes: true,
      'mandate.assetCap': true,
      'mandate.illiquidMax': true,
    });
    if (!valid) return;
    setBusy(true);
    setFailure(undefined);
    try {
      await onSubmit(fields);
    } catch (error) {
      setFailure(errorText(error));
    } finally {
      setBusy(false);
    }
  };

  const reason = (key: FieldName) =>
    touched[key] && why[key] ? (
      <div className="reason" id={`${id}-${key}-why`}>
        {why[key]}
      </div>
    ) : null;
  const invalid = (key: FieldName) => (touched[key] && why[key] ? true : undefined);
  const described = (key: FieldName) => (touched[key] && why[key] ? `${id}-${key}-why` : undefined);

  return (
    <form className="sheet" onSubmit={submit} noValidate aria-label="Household details">
      <div className="form-grid">
        <div className="field">
          <label htmlFor={`${id}-name`}>Name</label>
          <input
            id={`${id}-name`}
            type="text"
            value={fields.name}
            onChange={(e) => set('name', e.target.value)}
            aria-invalid={invalid('name')}
            aria-describedby={described('name')}
            autoComplete="off"
            size={40}
          />
          {reason('name')}
        </div>
        <div className="field">
          <label htmlFor={`${id}-ccy`}>Base currency</label>
          <input
            id={`${id}-ccy`}
            type="text"
            list={`${id}-ccys`}
            value={fields.baseCurrency}
            onChange={(e) => set('baseCurrency', e.target.value)}
            aria-invalid={invalid('baseCurrency')}
            aria-describedby={described('baseCurrency') ?? `${id}-ccy-hint`}
            maxLength={3}
            size={6}
            autoComplete="off"
          />
          <datalist id={`${id}-ccys`}>
            {COMMON_CURRENCIES.map((c) => (
              <option key={c} value={c} />
            ))}
          </datalist>
          {reason('baseCurrency') ?? (
            <div className="hint" id={`${id}-ccy-hint`}>
              ISO 4217 code; totals and trades are shown in it.
            </div>
          )}
        </div>
        <div className="field">
          <label htmlFor={`${id}-ref`}>Client reference</label>
          <input
            id={`${id}-ref`}
            type="text"
            value={fields.reference ?? ''}
            onChange={(e) => set('reference', e.target.value)}
            aria-invalid={invalid('reference')}
            aria-describedby={described('reference')}
            autoComplete="off"
          />
          {reason('reference')}
        </div>
      </div>
      <div className="field">
        <label htmlFor={`${id}-notes`}>Notes</label>
        <textarea
          id={`${id}-notes`}
          value={fields.notes ?? ''}
          onChange={(e) => set('notes', e.target.value)}
          aria-invalid={invalid('notes')}
          aria-describedby={described('notes')}
        />
        {reason('notes')}
      </div>
      <fieldset className="mandate-fields">
        <legend>Mandate</legend>
        <p className="hint">
          The standing limits a new scenario starts from; each can be tightened per scenario. Leave a field empty where
          the mandate sets no such limit: a new scenario then takes the stated default and says so.
        </p>
        {MANDATE_FIELDS.map(({ key, label, hint }) => (
          <PercentField
            key={key}
            label={label}
            path={`mandate.${key}`}
            value={mandate[key] ?? undefined}
            decimals={1}
            placeholder="none"
            hint={hint}
            messages={limitMessages(`mandate.${key}`)}
            onTyping={onTyping}
            onChange={(v) => setLimit(key, v)}
          />
        ))}
      </fieldset>
      {failure ? (
        <div className="note error" role="alert">
          {failure}
        </div>
      ) : null}
      <div className="actions">
        <button type="submit" className="primary" disabled={busy}>
          {submitLabel}
        </button>
        {onCancel ? (
          <button type="button" onClick={onCancel} disabled={busy}>
            Cancel
          </button>
        ) : null}
      </div>
    </form>
  );
}
