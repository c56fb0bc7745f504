import { memo } from 'react';
import { messagesAt } from '../validate-draft.js';
import { AssetChooser } from './AssetChooser.js';
import { AssetTable } from './AssetTable.js';
import { BacktestFields } from './BacktestFields.js';
import type { BriefProps } from './brief-props.js';
import { BriefContext, DocTextField } from './doc-fields.js';
import { EstimatesAndObjectives } from './EstimatesAndObjectives.js';
import { FieldNote } from './fields.js';
import { GroupBands } from './GroupBands.js';
import { LimitsFields } from './LimitsFields.js';
import { WindowFields } from './WindowFields.js';
import { setField } from '../editor-state.js';

export type { BriefProps } from './brief-props.js';

/**
 * The first part of the page: what the advisor is asking. Assets, the estimation window, the
 * risk estimates and objectives whose grid forms the candidates, the mandate's limits, the
 * current holdings and, where an objective needs them, expected returns. Each part is its own
 * file beside this one; the fields bound to one place of the document read the editor from
 * `BriefContext`.
 */
export const BriefSection = memo(function BriefSection(props: BriefProps) {
  const { state, commit, messages } = props;
  const set = (path: (string | number)[], value: unknown) => commit(setField(state, path, value), path.join('.'));
  const documentMessages = messagesAt(messages, '(document)');
  return (
    <BriefContext.Provider value={props}>
      <section className="section brief" aria-labelledby="brief-title">
        <div className="section-head">
          <h2 id="brief-title">1. The brief</h2>
          <span className="faint">What the candidates must answer: every field is checked as you type.</span>
        </div>
        <div className="brief-grid">
          <fieldset className="sheet">
            <legend>Scenario</legend>
            <DocTextField label="Name" at={['name']} required />
            <WindowFields {...props} />
          </fieldset>
          <AssetChooser {...props} />
        </div>
        <EstimatesAndObjectives {...props} />
        <LimitsFields {...props} set={set} />
        <AssetTable {...props} />
        <GroupBands {...props} />
        <BacktestFields {...props} />
        {documentMessages.length > 0 ? <FieldNote id="doc-messages" messages={documentMessages} /> : null}
      </section>
    </BriefContext.Provider>
  );
});
