import { useEffect, useId, useState, type FormEvent } from 'react';
import { api } from '../bridge.js';
import { CAUTIONS } from '../app/Cautions.js';
import { ErrorNote, errorText, Loading } from '../app/notes.js';
import { useLoad } from '../app/use-load.js';

/** Who is working (initials on revisions and memos) and which store this is. */
export function SettingsPage() {
  const id = useId();
  const settings = useLoad(() => api['settings.get']({}), []);
  const info = useLoad(() => api['app.info']({}), []);
  const [initials, setInitials] = useState('');
  const [saved, setSaved] = useState(false);
  const [failure, setFailure] = useState<string>();

  useEffect(() => {
    if (settings.data) setInitials(settings.data.preparedBy ?? '');
  }, [settings.data]);

  const reason = initials === '' || /^[A-Za-z]{2,4}$/.test(initials) ? undefined : 'two to four letters, such as JD';

  const save = async (event: FormEvent) => {
    event.preventDefault();
    if (reason) return;
    setFailure(undefined);
    setSaved(false);
    try {
      await api['settings.set']({ preparedBy: initials === '' ? null : initials });
      setSaved(true);
      settings.reload();
    } catch (error) {
      setFailure(errorText(error));
    }
  };

  return (
    <>
      <div className="page-head">
        <div>
          <h1>Settings</h1>
          <p className="muted">Kept on this machine, beside the store.</p>
        </div>
      </div>
      <section className="section" aria-labelledby={`${id}-who`}>
        <div className="section-head">
          <h2 id={`${id}-who`}>Prepared by</h2>
        </div>
        {settings.error ? <ErrorNote error={settings.error} /> : null}
        {!settings.data && !settings.error ? <Loading what="the settings" /> : null}
        <form className="sheet" onSubmit={save} noValidate>
          <div className="field">
            <label htmlFor={`${id}-initials`}>Your initials</label>
            <input
              id={`${id}-initials`}
              type="text"
              value={initials}
              maxLength={4}
              size={6}
              onChange={(e) => {
                setInitials(e.target.value.toUpperCase());
                setSaved(false);
              }}
              aria-invalid={reason ? true : undefined}
              aria-describedby={`${id}-initials-hint`}
            />
            {reason ? (
              <div className="reason">{reason}</div>
            ) : (
              <div className="hint" id={`${id}-initials-hint`}>
                Signed on every revision you save and printed on every memo.
              </div>
            )}
          </div>
          {failure ? (
            <div className="note error" role="alert">
              {failure}
            </div>
          ) : null}
          <div className="actions">
            <button type="submit" className="primary" disabled={!!reason}>
              Save
            </button>
            {saved ? (
              <span role="status" className="muted">
                Saved.
              </span>
            ) : null}
          </div>
        </form>
      </section>
      <section className="section" aria-labelledby={`${id}-store`}>
        <div className="section-head">
          <h2 id={`${id}-store`}>This store</h2>
        </div>
        {info.data ? (
          <dl className="facts sheet">
            <dt>File</dt>
            <dd className="code">{info.data.storePath}</dd>
            <dt>Holdfast version</dt>
            <dd>{info.data.version}</dd>
            <dt>Data version</dt>
            <dd className="tabular">{info.data.dataVersion} (rises with every price import)</dd>
            <dt>Contents</dt>
            <dd>{info.data.demo ? 'invented demonstration data' : 'your own data'}</dd>
          </dl>
        ) : null}
      </section>
      <section className="section" aria-labelledby={`${id}-cautions`}>
        <div className="section-head">
          <h2 id={`${id}-cautions`}>What the figures are</h2>
        </div>
        <ul>
          {CAUTIONS.map((c) => (
            <li key={c}>{c}</li>
          ))}
        </ul>
      </section>
    </>
  );
}
