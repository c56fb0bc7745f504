import { useCallback, useDeferredValue, useEffect, useLayoutEffect, useMemo, useRef, useState } from 'react';
import type {
  Asset,
  Holdings,
  HouseholdSummary,
  RevisionSummary,
  ScenarioDetail,
} from '../../shared-core/contract/service-api.js';
import { priceTableFromWire } from '../../shared-core/contract/service-api.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { fxSources, fxTable } from '../../shared-core/returns/exchange-rate.js';
import type { Scenario, ScenarioInput } from '../../shared-core/scenario/schema.js';
import { menu, useMenuCommands } from '../app/menu.js';
import { errorText } from '../app/notes.js';
import { api } from '../bridge.js';
import type { Comparison } from '../worker/comparison.js';
import type { RecomputeOutcome } from '../worker/recompute-client.js';
import { AnswerSection } from './answer/AnswerSection.js';
import { BriefSection } from './brief/BriefSection.js';
import { ApplyFix, EditorEpoch, FixButton } from './brief/fields.js';
import { setField, editorStateFor, type EditorState } from './editor-state.js';
import { formatDateTime, formatDuration, formatPercent } from './format.js';
import { illiquidCaution } from './answer/illiquid-caution.js';
import { formatTimeOfDay } from '../../shared-core/present/format.js';
import { applyEdit, canRedo, canUndo, createHistory, redo, undo, type History } from './history.js';
import { MemoSection } from './memo/MemoSection.js';
import { ReasonsSection } from './reasons/ReasonsSection.js';
import { BesidePanel, RevisionBar } from './revisions/RevisionBar.js';
import { fillStoreGaps } from './store-gaps.js';
import { useRecompute } from './use-recompute.js';
import { keptWalkForwardSettings } from './walkforward/kept-settings.js';
import { WalkForwardSection } from './walkforward/WalkForwardSection.js';
import { checkDraft, describeMessage, type FieldMessage } from './validate-draft.js';
import { describeField, inFieldWords } from '../../shared-core/present/field-words.js';
import './scenario.css';

/**
 * The scenario page, top to bottom in the order an advisor argues: the brief (inputs), the
 * candidates (the answer), the reasons (the evidence). Every edit is checked where it is typed
 * and recomputed in a worker; the last good comparison stays on screen when an edit is bad, with
 * the reason shown. Drafts save themselves; revisions are saved with a note.
 */
export function ScenarioPage(props: { householdId: string; scenarioId: string }) {
  const [boot, setBoot] = useState<Boot | { error: unknown } | null>(null);
  useEffect(() => {
    let live = true;
    setBoot(null);
    loadBoot(props.householdId, props.scenarioId).then(
      (b) => live && setBoot(b),
      (error: unknown) => live && setBoot({ error }),
    );
    return () => {
      live = false;
    };
  }, [props.householdId, props.scenarioId]);
  if (boot === null)
    return (
      <p className="muted" role="status">
        Reading the scenario…
      </p>
    );
  if ('error' in boot)
    return (
      <div className="note error" role="alert">
        <strong>The scenario could not be opened: </strong>
        {errorText(boot.error)}
      </div>
    );
  return <ScenarioWorkspace key={props.scenarioId} boot={boot} scenarioId={props.scenarioId} />;
}

interface Boot {
  detail: ScenarioDetail;
  household: HouseholdSummary;
  holdings: Holdings | null;
  catalogue: Asset[];
  preparedBy: string | null;
  revisions: RevisionSummary[];
  /** The document the editor opens with, and where it came from. */
  initial: ScenarioInput;
  openedDraft: boolean;
}

/**
 * The holdings valued in the scenario's base currency, as the memo and `holdfast solve --store`
 * value them (app/value-holdings.ts), so the trade list and the current weights agree with both.
 */
function valuedHoldings(householdId: string, baseCurrency: string): Promise<Holdings | null> {
  return api['holdings.get']({ householdId, baseCurrency }).catch(() => null);
}

async function loadBoot(householdId: string, scenarioId: string): Promise<Boot> {
  const [detail, household, catalogue, settings, revisions] = await Promise.all([
    api['scenarios.get']({ scenarioId }),
    api['households.get']({ householdId }),
    api['assets.list']({}),
    api['settings.get']({}).catch(() => ({ preparedBy: null })),
    api['scenarios.revisions']({ scenarioId }),
  ]);
  const draft = detail.draft?.document;
  const openedDraft = detail.scenario.hasDraft && draft !== null && typeof draft === 'object';
  const initial = (openedDraft ? draft : detail.document) as ScenarioInput | null;
  if (!initial) throw new Error('the scenario has neither a saved revision nor a readable draft');
  const holdings = await valuedHoldings(householdId, initial.baseCurrency ?? household.baseCurrency);
  return { detail, household, holdings, catalogue, preparedBy: settings.preparedBy, revisions, initial, openedDraft };
}

interface Good {
  comparison: Comparison;
  scenario: Scenario;
}

type Problem = { summary: string; details: string[]; messages: FieldMessage[] };

/** Time from the last edit (or the page opening) to the comparison painted on screen. */
interface Shown {
  /** Counts the measures, so a reader can wait for the one after its edit. */
  seq: number;
  ms: number;
  /** To the charts below the comparison drawn with the same result as well. */
  chartsMs: number;
  computeMs: number;
  afterEdit: boolean;
  phases: [number, number, number] | null;
}

const AUTOSAVE_MS = 900;

function ScenarioWorkspace({ boot, scenarioId }: { boot: Boot; scenarioId: string }) {
  const locale = undefined;
  const [history, setHistory] = useState<History<EditorState>>(() => createHistory(editorStateFor(boot.initial)));
  const state = history.present;
  const doc = state.doc;
  const [typing, setTyping] = useState<Record<string, string>>({});
  const lastEditAt = useRef<number>(performance.now());
  const edited = useRef(false);

  /** An edit computed from the latest state (for fields that do not re-render on every keystroke). */
  const update = useCallback((edit: (state: EditorState) => EditorState, key?: string) => {
    lastEditAt.current = performance.now();
    edited.current = true;
    setHistory((h) => applyEdit(h, edit(h.present), { key, at: Date.now() }));
  }, []);
  const commit = useCallback((next: EditorState, key?: string) => {
    lastEditAt.current = performance.now();
    edited.current = true;
    setHistory((h) => applyEdit(h, next, { key, at: Date.now() }));
  }, []);
  const onTyping = useCallback((path: string, message: string | null) => {
    lastEditAt.current = performance.now();
    setTyping((t) => {
      if (message === null) {
        if (!(path in t)) return t;
        const rest = { ...t };
        delete rest[path];
        return rest;
      }
      return t[path] === message ? t : { ...t, [path]: message };
    });
  }, []);
  // Undo, redo and loading a revision rewrite fields under the cursor too (see EditorEpoch).
  const [epoch, setEpoch] = useState(0);
  const doUndo = useCallback(() => {
    setHistory((h) => undo(h));
    setEpoch((e) => e + 1);
  }, []);
  const doRedo = useCallback(() => {
    setHistory((h) => redo(h));
    setEpoch((e) => e + 1);
  }, []);

  // ---- prices for the chosen assets ----
  const assetKey = (doc.assets ?? []).slice().sort().join('|');
  const baseCurrency = typeof doc.baseCurrency === 'string' ? doc.baseCurrency : boot.household.baseCurrency;
  const [prices, setPrices] = useState<{
    key: string;
    table: PriceTable;
    fx?: PriceTable;
    dataVersion: number;
  } | null>(null);
  const [pricesError, setPricesError] = useState<unknown>(null);
  useEffect(() => {
    if (!assetKey) return;
    let live = true;
    const assets = assetKey.split('|');
    const load = async () => {
      const r = await api['prices.table']({ assets });
      const table = priceTableFromWire(r.table);
      // Assets priced in another currency are measured in the base one with the store's rates;
      // a currency without a rate is left to the core, which says which asset lacks one.
      const { sources } = fxSources(
        table.currencies,
        baseCurrency,
        (b, q) => boot.catalogue.find((a) => a.fx?.base === b && a.fx.quote === q)?.id,
      );
      let fx: PriceTable | undefined;
      if (sources.length > 0) {
        const rates = await api['prices.table']({ assets: sources.map((x) => x.assetId) });
        fx = fxTable(priceTableFromWire(rates.table), sources);
      }
      return { key: assetKey, table, fx, dataVersion: r.dataVersion };
    };
    load().then(
      (loaded) => {
        if (!live) return;
        setPrices(loaded);
        setPricesError(null);
      },
      (error: unknown) => live && setPricesError(error),
    );
    return () => {
      live = false;
    };
  }, [assetKey, baseCurrency, boot.catalogue]);
  const pricesNow = prices && prices.key === assetKey ? prices.table : undefined;
  // The holdings follow the draft's base currency: the trade list is told in it.
  const [holdings, setHoldings] = useState<Holdings | null>(boot.holdings);
  useEffect(() => {
    if (holdings === null || holdings.baseCurrency === baseCurrency) return;
    let live = true;
    void valuedHoldings(boot.household.id, baseCurrency).then((h) => live && setHoldings(h));
    return () => {
      live = false;
    };
  }, [baseCurrency, holdings, boot.household.id]);

  // ---- checks as typed ----
  const check = useMemo(() => checkDraft(doc, { prices: pricesNow, typing }), [doc, pricesNow, typing]);

  // ---- recompute ----
  const [good, setGood] = useState<Good | null>(null);
  const [problem, setProblem] = useState<Problem | null>(null);
  const [shown, setShown] = useState<Shown | null>(null);
  /** The measure under way: the result it is for, when its edit was, and the moments seen so far. */
  const measuring = useRef<{
    comparison: Comparison;
    from: number;
    started: number;
    finished: number;
    tableAt?: number;
    chartsAt?: number;
  } | null>(null);
  const hadGood = useRef(false);
  const onOutcome = useCallback((o: RecomputeOutcome) => {
    if (o.kind === 'cancelled') {
      setProblem({
        summary: 'Recompute cancelled; the comparison below is from the last finished run.',
        details: [],
        messages: [],
      });
      return;
    }
    if (o.kind === 'failed') {
      const messages: FieldMessage[] =
        o.input && o.path ? [{ path: o.path, message: inFieldWords(o.path, o.message), source: 'check' }] : [];
      setProblem({
        summary: o.input
          ? hadGood.current
            ? 'These inputs cannot be computed; the comparison below is from the last inputs that could.'
            : 'These inputs cannot be computed yet; no comparison to show.'
          : hadGood.current
            ? 'The recompute failed; the comparison below is from the last run that finished.'
            : 'The recompute failed; no comparison to show.',
        details: [o.path ? describeField(o.path, o.message) : o.message],
        messages,
      });
      return;
    }
    const anySolved = o.comparison.candidates.some((c) => c.status === 'optimal');
    if (!anySolved && hadGood.current) {
      setProblem({
        summary:
          'No candidate can be solved with these inputs; the comparison below is from the last inputs that solved.',
        details: o.comparison.candidates.map((c) => `${c.id}: ${c.status === 'optimal' ? c.status : c.message}`),
        messages: [],
      });
      return;
    }
    hadGood.current = true;
    measuring.current = {
      comparison: o.comparison,
      from: lastEditAt.current,
      started: o.startedAt,
      finished: o.finishedAt,
    };
    setGood({ comparison: o.comparison, scenario: o.scenario });
    setProblem(null);
  }, []);
  const recompute = useRecompute(onOutcome);
  const first = useRef(true);
  useEffect(() => {
    if (!check.ok || !pricesNow) return;
    recompute.request(fillStoreGaps(check.scenario, boot.catalogue, holdings), pricesNow, first.current, prices?.fx);
    first.current = false;
  }, [check, pricesNow, holdings]);
  // Time from the last keystroke to the comparison on screen, after the browser has painted it.
  // Registered in a layout effect, before the browser paints this commit: the frame callback runs
  // in the frame that paints the new comparison, and a task queued from it runs once that frame's
  // paint is done. The charts below report their own moment (AnswerSection's onChartsDrawn).
  const report = useCallback(() => {
    const m = measuring.current;
    if (!m || m.tableAt === undefined || m.chartsAt === undefined) return;
    measuring.current = null;
    const { from, started, finished, tableAt } = m;
    const chartsAt = Math.max(m.chartsAt, tableAt);
    setShown((before) => ({
      seq: (before?.seq ?? 0) + 1,
      ms: tableAt - from,
      chartsMs: chartsAt - from,
      computeMs: m.comparison.computeMs,
      afterEdit: edited.current,
      // Edit to run start (queue); the run with its copies to and from the worker; render and paint.
      phases: [started - from, finished - started, tableAt - finished],
    }));
  }, []);
  useLayoutEffect(() => {
    const m = measuring.current;
    if (!good || !m || m.comparison !== good.comparison) return;
    requestAnimationFrame(() =>
      setTimeout(() => {
        m.tableAt = performance.now();
        if (measuring.current === m) report();
      }, 0),
    );
  }, [good, report]);
  const onChartsDrawn = useCallback(
    (comparison: Comparison, at: number) => {
      const m = measuring.current;
      if (!m || m.comparison !== comparison) return;
      m.chartsAt = at;
      report();
    },
    [report],
  );

  // ---- autosave the draft ----
  const [draft, setDraft] = useState<{ savedAt?: string; error?: unknown; saving: boolean }>({
    saving: false,
    savedAt: boot.openedDraft ? (boot.detail.draft?.savedAt ?? undefined) : undefined,
  });
  const savedDoc = useRef<ScenarioInput>(boot.initial);
  useEffect(() => {
    if (doc === savedDoc.current) return;
    const timer = setTimeout(() => {
      // Saved as a revision since this edit: a draft now would stand for changes there are not.
      if (doc === savedDoc.current) return;
      setDraft((d) => ({ ...d, saving: true }));
      api['scenarios.saveDraft']({ scenarioId, document: doc }).then(
        (r) => {
          savedDoc.current = doc;
          setDraft({ saving: false, savedAt: r.savedAt });
        },
        (error: unknown) => setDraft({ saving: false, error }),
      );
    }, AUTOSAVE_MS);
    return () => clearTimeout(timer);
  }, [doc, scenarioId]);

  // ---- revisions ----
  const [revisions, setRevisions] = useState(boot.revisions);
  // The initials in the settings, asked once (at the first save) and then kept.
  const [preparedBy, setPreparedBy] = useState(boot.preparedBy);
  const [beside, setBeside] = useState<number | null>(null);
  const reloadRevisions = useCallback(
    () => api['scenarios.revisions']({ scenarioId }).then(setRevisions),
    [scenarioId],
  );
  const loadDocument = useCallback(
    (next: ScenarioInput) => {
      commit(editorStateFor(next), `restore-${Date.now()}`);
      setEpoch((e) => e + 1);
    },
    [commit],
  );

  // ---- keyboard ----
  const saveButton = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const mod = e.ctrlKey || e.metaKey;
      // In the desktop window the menu sends the same commands for these keys; menu.fromKeyboard
      // keeps one key press from acting twice.
      if (mod && !e.altKey && e.key.toLowerCase() === 'z') {
        e.preventDefault();
        if (e.shiftKey) {
          if (menu.fromKeyboard('redo')) doRedo();
        } else if (menu.fromKeyboard('undo')) doUndo();
      } else if (mod && e.key.toLowerCase() === 'y') {
        e.preventDefault();
        if (menu.fromKeyboard('redo')) doRedo();
      } else if (mod && e.key.toLowerCase() === 's') {
        e.preventDefault();
        if (menu.fromKeyboard('save-revision')) saveButton.current?.click();
      } else if (e.key === 'Escape' && recompute.state.busy) {
        recompute.cancel();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [doUndo, doRedo, recompute]);
  // The desktop window's menu (the memo part answers its own "print memo").
  const openSave = useCallback(() => saveButton.current?.click(), []);
  useMenuCommands({ undo: doUndo, redo: doRedo, 'save-revision': openSave });

  const [focus, setFocus] = useState<string | undefined>(undefined);
  const stateRef = useRef(state);
  stateRef.current = state;
  const applyFix = useCallback(
    (path: (string | number)[], value: unknown) => {
      commit(setField(stateRef.current, path, value), path.join('.'));
      setEpoch((e) => e + 1);
    },
    [commit],
  );
  const recommend = useCallback(
    (id: string | undefined) => commit(setField(stateRef.current, ['recommended'], id)),
    [commit],
  );
  // A walk-forward run on the defaults keeps its settings in the draft, so the saved revision's
  // memo prints it as `holdfast memo` prints it.
  const keepWalkForward = useCallback(() => {
    if (stateRef.current.doc.backtest === undefined) applyFix(['backtest'], keptWalkForwardSettings());
  }, [applyFix]);
  const names = useMemo(() => new Map(boot.catalogue.map((a) => [a.id, a.name])), [boot.catalogue]);
  const messages = useMemo(() => [...check.messages, ...(problem?.messages ?? [])], [check, problem]);
  // The same function while the candidates keep their ids, so the reasons and the walk-forward
  // part do not render again for a result that only moved figures.
  const candidateIds = (good?.scenario.candidates ?? []).map((c) => c.id).join('\n');
  const colourIndex = useCallback((id: string) => Math.max(0, candidateIds.split('\n').indexOf(id)), [candidateIds]);
  const deferredCandidates = useDeferredValue(good?.comparison.candidates);
  const stale = recompute.state.busy || !check.ok || problem !== null;
  // While the scenario has only its first revision, say where its limits and frequency came from.
  const started =
    revisions.length === 1 && revisions[0].note.startsWith('Started: ')
      ? revisions[0].note.slice('Started: '.length)
      : null;

  return (
    <div className="scenario-page" data-testid="scenario-page">
      <header className="scenario-head">
        <div>
          <p className="faint">{boot.household.name}</p>
          <h1>{doc.name || boot.detail.scenario.name}</h1>
          <p className="faint">
            {revisions[0]
              ? `Revision ${revisions[0].number} saved ${formatDateTime(revisions[0].savedAt, locale)} by ${revisions[0].author}`
              : 'No revision yet'}
            {' · '}
            <span data-testid="draft-status">
              {draft.saving
                ? 'saving draft…'
                : draft.error
                  ? `draft not saved: ${errorText(draft.error)}`
                  : draft.savedAt
                    ? `draft saved ${formatTimeOfDay(draft.savedAt, locale)}`
                    : 'no unsaved changes'}
            </span>
          </p>
        </div>
        <div className="actions head-actions" role="toolbar" aria-label="Scenario actions">
          <button type="button" onClick={doUndo} disabled={!canUndo(history)} aria-keyshortcuts="Control+Z">
            Undo
          </button>
          <button type="button" onClick={doRedo} disabled={!canRedo(history)} aria-keyshortcuts="Control+Shift+Z">
            Redo
          </button>
          <RevisionBar
            scenarioId={scenarioId}
            document={doc}
            valid={check.ok}
            preparedBy={preparedBy}
            onInitialsKept={setPreparedBy}
            revisions={revisions}
            saveButton={saveButton}
            onSaved={() => {
              savedDoc.current = doc;
              setDraft({ saving: false, savedAt: undefined });
              void reloadRevisions();
            }}
            onOpenBeside={setBeside}
          />
        </div>
      </header>
      <ApplyFix.Provider value={applyFix}>
        <RecomputeStatus
          busy={recompute.state.busy}
          onCancel={recompute.cancel}
          check={check.ok ? [] : check.messages}
          problem={problem}
          shown={shown}
          pricesError={pricesError}
          hasResult={good !== null}
        />
      </ApplyFix.Provider>
      {started ? (
        <p className="note" role="note" data-testid="starting-note">
          <strong>How this scenario started: </strong>
          {started}
        </p>
      ) : null}
      {boot.openedDraft ? (
        <p className="note" role="note">
          Opened the unsaved draft of {formatDateTime(boot.detail.draft?.savedAt ?? '', locale)}; the latest revision is{' '}
          {boot.detail.scenario.latestRevision?.number ?? 'none'}. Save it as a revision to keep it in the history.
        </p>
      ) : null}
      <div className={beside !== null ? 'with-beside' : undefined}>
        <div className="scenario-main">
          <ApplyFix.Provider value={applyFix}>
            <EditorEpoch.Provider value={epoch}>
              <BriefSection
                state={state}
                commit={commit}
                update={update}
                messages={messages}
                onTyping={onTyping}
                catalogue={boot.catalogue}
                holdings={holdings}
                locale={locale}
              />
            </EditorEpoch.Provider>
          </ApplyFix.Provider>
          {good ? (
            <>
              <IlliquidNote scenario={good.scenario} candidates={good.comparison.candidates} locale={locale} />
              <AnswerSection
                comparison={good.comparison}
                scenario={good.scenario}
                recommended={doc.recommended}
                focused={focus}
                onFocus={setFocus}
                onRecommend={recommend}
                holdings={holdings}
                names={names}
                locale={locale}
                stale={stale}
                onChartsDrawn={onChartsDrawn}
              />
              <ReasonsSection
                candidates={deferredCandidates ?? good.comparison.candidates}
                focused={focus ?? doc.recommended}
                onFocus={setFocus}
                colourIndex={colourIndex}
                locale={locale}
              >
                <WalkForwardSection
                  scenario={good.scenario}
                  prices={pricesNow}
                  fx={prices?.fx}
                  colourIndex={colourIndex}
                  onRan={keepWalkForward}
                />
              </ReasonsSection>
            </>
          ) : null}
          <MemoSection
            scenarioId={scenarioId}
            householdName={boot.household.name}
            revisions={revisions}
            unsaved={draft.saving || draft.savedAt !== undefined || doc !== savedDoc.current}
            preparedBy={preparedBy}
            onSaveFirst={openSave}
          />
        </div>
        {beside !== null ? (
          <BesidePanel
            scenarioId={scenarioId}
            revision={beside}
            current={doc}
            currentComparison={good?.comparison ?? null}
            prices={pricesNow}
            fx={prices?.fx}
            onClose={() => setBeside(null)}
            onLoad={loadDocument}
            locale={locale}
          />
        ) : null}
      </div>
    </div>
  );
}

function RecomputeStatus(props: {
  busy: boolean;
  onCancel: () => void;
  check: readonly FieldMessage[];
  problem: Problem | null;
  shown: Shown | null;
  pricesError: unknown;
  hasResult: boolean;
}) {
  const state = props.busy ? 'busy' : props.check.length > 0 || props.problem ? 'kept' : 'fresh';
  return (
    <div
      className={`recompute-status ${state}`}
      data-testid="recompute-status"
      data-state={state}
      data-shown-seq={props.shown ? props.shown.seq : undefined}
      data-shown-ms={props.shown ? props.shown.ms.toFixed(1) : undefined}
      data-charts-ms={props.shown ? props.shown.chartsMs.toFixed(1) : undefined}
      data-after-edit={props.shown ? String(props.shown.afterEdit) : undefined}
      data-phases-ms={props.shown?.phases ? props.shown.phases.map((v) => v.toFixed(0)).join(' ') : undefined}
      data-compute-ms={props.shown ? props.shown.computeMs.toFixed(1) : undefined}
    >
      <p role="status" aria-live="polite">
        {props.busy ? (
          <>
            <span className="spinner" aria-hidden="true" /> Recomputing the candidates…{' '}
          </>
        ) : props.check.length > 0 ? (
          <>
            <span className="marker" aria-hidden="true">
              ◆
            </span>{' '}
            {props.check.length === 1 ? 'One input needs attention' : `${props.check.length} inputs need attention`}
            {props.hasResult ? '; the comparison below is from the last inputs that were complete.' : '.'}
          </>
        ) : props.problem ? (
          <>
            <span className="marker" aria-hidden="true">
              ◆
            </span>{' '}
            {props.problem.summary}
          </>
        ) : props.shown ? (
          <>
            Up to date: shown {formatDuration(props.shown.ms)} after the last edit (solve{' '}
            {formatDuration(props.shown.computeMs)}).
          </>
        ) : (
          'Up to date.'
        )}
        {props.busy ? (
          <button type="button" className="quiet" onClick={props.onCancel} aria-keyshortcuts="Escape">
            Cancel
          </button>
        ) : null}
      </p>
      {props.check.length > 0 ? (
        <ul className="problem-list" data-testid="input-problems">
          {props.check.map((m, i) => (
            <li key={i}>
              {describeMessage(m)} <FixButton fix={m.fix} />
            </li>
          ))}
        </ul>
      ) : null}
      {props.problem && props.problem.details.length > 0 ? (
        <ul className="problem-list" data-testid="run-problems">
          {props.problem.details.map((d, i) => (
            <li key={i}>{d}</li>
          ))}
        </ul>
      ) : null}
      {props.pricesError ? (
        <p className="note error">The prices could not be read: {errorText(props.pricesError)}</p>
      ) : null}
    </div>
  );
}

function IlliquidNote(props: { scenario: Scenario; candidates: Comparison['candidates']; locale?: string }) {
  const caution = illiquidCaution(props.scenario, props.candidates);
  if (!caution) return null;
  return (
    <p className="note warning" role="note" data-testid="illiquid-caution">
      <span className="marker" aria-hidden="true">
        ◆
      </span>{' '}
      <strong>Caution: </strong>
      {caution.candidate} puts {formatPercent(caution.weight, props.locale)} in illiquid assets (
      {caution.assets.join(', ')}), and the scenario sets no cap on them. Money in a fund with a lock-up cannot be taken
      back on request: set “Cap on illiquid assets together” under the mandate limits.
    </p>
  );
}
