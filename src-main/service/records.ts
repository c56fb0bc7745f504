import type {
  Asset,
  Household,
  HouseholdSummary,
  MemoSummary,
  RevisionSummary,
  Universe,
  UniverseMember,
} from '../../shared-core/contract/service-api.js';
import type { AssetRecord, HouseholdRecord, MemoInfo, RevisionInfo, Store, UniverseRecord } from '../store/store.js';
import { valueHoldings } from '../app/value-holdings.js';
import { NO_MANDATE } from '../../shared-core/scenario/household-mandate.js';

/** Store records to the wire shapes of the service API (one function per record). */

export function assetOut(record: AssetRecord): Asset {
  return {
    id: record.id,
    name: record.displayName,
    assetClass: record.assetClass ?? '',
    region: record.region ?? '',
    currency: record.currency ?? null,
    liquidity: record.liquidity.tag,
    lockUpDays: record.liquidity.lockUpDays ?? null,
    notes: record.notes ?? '',
    fx: record.fx ?? null,
  };
}

export function universeOut(record: UniverseRecord): Universe {
  return {
    id: String(record.id),
    name: record.name,
    description: record.description ?? '',
    assetCount: record.members.length,
  };
}

export function memberOut(store: Store, member: UniverseRecord['members'][number]): UniverseMember {
  const asset = store.getAsset(member.assetId);
  // Membership rows reference assets by foreign key, so a missing asset is a damaged store.
  if (!asset) throw new Error(`universe member '${member.assetId}' has no asset record`);
  return { asset: assetOut(asset), groups: [...member.tags] };
}

export function revisionOut(info: RevisionInfo): RevisionSummary {
  return {
    scenarioId: String(info.scenarioId),
    number: info.number,
    hash: info.hash,
    savedAt: info.savedAt,
    author: info.author,
    note: info.note ?? '',
  };
}

export function memoOut(info: MemoInfo): MemoSummary {
  return {
    id: String(info.id),
    scenarioId: String(info.scenarioId),
    revisionHash: info.revisionHash,
    dataVersion: info.dataVersion,
    hash: info.sha256,
    printedAt: info.printedAt,
    title: info.title ?? '',
    bytes: info.bytes,
    ...(info.memoHash !== undefined ? { memoHash: info.memoHash } : {}),
    ...(info.preparedBy !== undefined ? { preparedBy: info.preparedBy } : {}),
  };
}

/** Created and last-changed times come from the audit log, which records every change. */
function householdTimes(store: Store, id: number): { createdAt: string | null; updatedAt: string | null } {
  const times = [
    ...store.auditLog({ entity: 'household', entityId: id }),
    ...store.auditLog({ entity: 'holdings', entityId: id }),
  ]
    .map((e) => e.at)
    .sort();
  return { createdAt: times[0] ?? null, updatedAt: times[times.length - 1] ?? null };
}

export function householdOut(store: Store, record: HouseholdRecord): Household {
  return {
    id: String(record.id),
    name: record.name,
    baseCurrency: record.baseCurrency,
    reference: record.reference ?? '',
    notes: record.notes ?? '',
    mandate: record.mandate ?? NO_MANDATE,
    ...householdTimes(store, record.id),
  };
}

export function householdSummaryOut(store: Store, record: HouseholdRecord): HouseholdSummary {
  const valued = valueHoldings(store, record, record.baseCurrency, store.holdings(record.id));
  return {
    ...householdOut(store, record),
    scenarioCount: store.listScenarios(record.id).length,
    holdingsAsOf: valued.asOf,
    holdingsTotal: valued.total,
  };
}
