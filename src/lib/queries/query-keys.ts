import { ME_QUERY_KEY } from '../session';

/** The filters a runs-list query is keyed by (the runs feature defines their meaning). */
export type RunsListKey = object;

/**
 * Every query key the client uses, from one factory: a feature that reads or invalidates
 * another feature's data (the packs, a bench, a run) names the same key, never a copy of it.
 * Keys nest so that invalidating `all` refreshes every query below it.
 */
export const queryKeys = {
  me: ME_QUERY_KEY,
  settings: ['settings'] as const,
  alarms: {
    all: ['alarms'] as const,
    ofRun: (runId: number) => ['alarms', 'run', runId] as const,
    detail: (alarmId: number) => ['alarms', alarmId] as const,
    inbox: () => ['alarms', 'inbox'] as const,
    subscriptions: () => ['alarms', 'subscriptions'] as const,
    channels: () => ['alarms', 'channels'] as const,
    outbox: () => ['alarms', 'outbox'] as const,
  },
  gateways: { all: ['gateways'] as const },
  benches: {
    all: ['benches'] as const,
    list: () => ['benches'] as const,
    detail: (benchId: number | null) => ['benches', benchId] as const,
    serialPorts: () => ['benches', 'ports'] as const,
  },
  batteries: {
    all: ['batteries'] as const,
    list: () => ['batteries'] as const,
    detail: (batteryId: number | null) => ['batteries', batteryId] as const,
    inspection: (batteryId: number) => ['batteries', batteryId, 'inspection'] as const,
    protections: (batteryId: number) => ['batteries', batteryId, 'protections'] as const,
  },
  inspectionItems: ['inspection-items'] as const,
  instruments: {
    all: ['instruments'] as const,
    list: (benchId: number | null) => ['instruments', 'list', benchId] as const,
    ofRun: (runId: number) => ['instruments', 'run', runId] as const,
  },
  runs: {
    all: ['runs'] as const,
    lists: () => ['runs', 'list'] as const,
    list: (filter: RunsListKey) => ['runs', 'list', filter] as const,
    detail: (runId: number) => ['runs', runId] as const,
    events: (runId: number) => ['runs', runId, 'events'] as const,
    noteHistory: (runId: number) => ['runs', runId, 'note-history'] as const,
    readings: (runId: number, from: number | null, to: number | null, maxPoints: number) => ['runs', runId, 'readings', from, to, maxPoints] as const,
    signoffs: (runId: number) => ['runs', runId, 'signoffs'] as const,
    programme: (runId: number) => ['runs', runId, 'programme'] as const,
    commandLog: (runId: number) => ['runs', runId, 'command-log'] as const,
  },
  programmes: {
    all: ['programmes'] as const,
    detail: (programmeId: number) => ['programmes', programmeId] as const,
  },
  shareLinks: (kind: 'run' | 'battery', targetId: number) => ['share-links', kind, targetId] as const,
  shareLinkMails: (linkId: number) => ['share-links', 'mails', linkId] as const,
  shared: (token: string) => ['shared', token] as const,
  users: { all: ['users'] as const },
} as const;
