import { randomBytes } from 'node:crypto';
import { Op, type Sequelize } from 'sequelize';
import type { Gateway, GatewayConfigMessage } from '../../shared/schemas/gateway.js';
import { benchModel, type BenchRow } from '../benches/bench-model.js';
import { toManaged } from '../benches/bench-service.js';
import type { BenchManager } from '../ingest/bench-manager.js';
import type { BrokerAccount } from './broker/broker-files.js';
import { hashBrokerPassword } from './broker/broker-files.js';
import type { MosquittoBroker } from './broker/mosquitto-broker.js';
import type { GatewayLink } from './gateway-link.js';
import { gatewayModel, type GatewayRow } from './gateway-model.js';
import { gatewayUsername } from './topics.js';

/** Bytes of randomness in a gateway's password (shown once, base64url). */
const PASSWORD_BYTES = 24;

/** A registration refused because the name is taken. */
export class GatewayNameTakenError extends Error {}
/** A bench id that does not exist. */
export class UnknownBenchError extends Error {}

/** What the gateway service works with. */
export interface GatewayServiceDeps {
  sequelize: Sequelize;
  broker: MosquittoBroker;
  serverAccount: BrokerAccount;
  link: () => GatewayLink | undefined;
  manager: () => BenchManager | undefined;
}

/**
 * Registering, revoking and assigning bench gateways. Each change rewrites the broker's
 * password and ACL files (a gateway may publish only its own benches' feeds), tells the
 * link, restarts the affected benches' sources and republishes the gateways' configurations.
 */
export function createGatewayService(deps: GatewayServiceDeps) {
  const Gateways = gatewayModel(deps.sequelize);
  const Benches = benchModel(deps.sequelize);

  const benchIdsByGateway = async (): Promise<Map<number, number[]>> => {
    const map = new Map<number, number[]>();
    for (const b of await Benches.findAll({ where: { gatewayId: { [Op.ne]: null } }, attributes: ['id', 'gatewayId'] })) {
      map.set(b.gatewayId!, [...(map.get(b.gatewayId!) ?? []), b.id]);
    }
    return map;
  };

  const syncAccess = async (): Promise<void> => {
    const byGateway = await benchIdsByGateway();
    const rows = await Gateways.findAll({ where: { revokedAt: null } });
    await deps.broker.setAccess({
      server: deps.serverAccount,
      gateways: rows.map((g) => ({ name: g.name, username: gatewayUsername(g.name), benchIds: byGateway.get(g.id) ?? [], passwordHash: g.passwordHash })),
    });
    await deps.link()?.refresh();
  };

  const toApi = (row: GatewayRow, benchIds: number[]): Gateway => {
    const live = deps.link()?.liveState(row.name);
    const revoked = row.revokedAt !== null;
    return {
      id: row.id,
      name: row.name,
      username: gatewayUsername(row.name),
      revoked,
      benchIds,
      createdAt: row.createdAt.toISOString(),
      state: {
        online: !revoked && (live?.online ?? false),
        lastSeenAt: live?.lastSeenMs ? new Date(live.lastSeenMs).toISOString() : null,
        clockOffsetMs: live?.clockOffsetMs ?? null,
        outboxDepth: live?.outboxDepth ?? null,
      },
    };
  };

  return {
    /** Writes the broker's files from the database (at start-up). */
    syncAccess,

    /** The registered, not revoked gateways, for the link. */
    known: async () => (await Gateways.findAll({ where: { revokedAt: null } })).map((g) => ({ id: g.id, name: g.name })),

    /** Every gateway with its benches and live state, by name. */
    async list(): Promise<Gateway[]> {
      const byGateway = await benchIdsByGateway();
      return (await Gateways.findAll({ order: [['name', 'ASC']] })).map((g) => toApi(g, byGateway.get(g.id) ?? []));
    },

    /** One gateway, or null. */
    async find(id: number): Promise<Gateway | null> {
      const row = await Gateways.findByPk(id);
      return row ? toApi(row, (await benchIdsByGateway()).get(id) ?? []) : null;
    },

    /** Registers a gateway; the password is returned here once and only its hash is kept. */
    async create(name: string): Promise<{ gateway: Gateway; password: string }> {
      if (await Gateways.findOne({ where: { name } })) throw new GatewayNameTakenError(`a gateway named ${name} exists`);
      const password = randomBytes(PASSWORD_BYTES).toString('base64url');
      const passwordHash = await hashBrokerPassword(deps.broker.binaries.passwd, gatewayUsername(name), password);
      const row = await Gateways.create({ name, passwordHash });
      await syncAccess();
      return { gateway: toApi(row, []), password };
    },

    /** Revokes a gateway: the broker refuses its password from now on and its benches stop taking its frames. */
    async revoke(id: number): Promise<Gateway | null> {
      const row = await Gateways.findByPk(id);
      if (!row) return null;
      if (!row.revokedAt) await row.update({ revokedAt: new Date() });
      await syncAccess();
      await restartBenches(await Benches.findAll({ where: { gatewayId: id } }));
      return toApi(row, (await benchIdsByGateway()).get(id) ?? []);
    },

    /** Makes `benchIds` exactly the benches this gateway runs (others it ran go back to this server). */
    async assign(id: number, benchIds: number[]): Promise<Gateway | null> {
      const row = await Gateways.findByPk(id);
      if (!row) return null;
      const wanted = [...new Set(benchIds)];
      const found = await Benches.findAll({ where: { id: wanted } });
      if (found.length !== wanted.length) throw new UnknownBenchError('a bench in benchIds does not exist');
      const before = await Benches.findAll({ where: { gatewayId: id } });
      await Benches.update({ gatewayId: null }, { where: { gatewayId: id } });
      if (wanted.length > 0) await Benches.update({ gatewayId: id }, { where: { id: wanted } });
      await syncAccess();
      const changed = await Benches.findAll({ where: { id: [...new Set([...wanted, ...before.map((b) => b.id)])] } });
      await restartBenches(changed);
      deps.link()?.scheduleConfig(id);
      return toApi(row, wanted.sort((a, b) => a - b));
    },

    /**
     * A bench this gateway ran was deleted: the broker's ACL stops granting its feed topic
     * and the gateway gets its new configuration now, not at the next change.
     */
    async benchDeleted(gatewayId: number): Promise<void> {
      await syncAccess();
      await deps.link()?.publishConfigNow(gatewayId);
    },

    /** What a gateway runs: its assigned benches' sources (none once revoked). */
    async configFor(gatewayId: number): Promise<GatewayConfigMessage> {
      const row = await Gateways.findByPk(gatewayId);
      if (!row || row.revokedAt) return { benches: [] };
      const benches = await Benches.findAll({ where: { gatewayId }, order: [['id', 'ASC']] });
      return { benches: benches.map((b) => { const m = toManaged(b); return { id: m.id, source: m.source, enabled: m.enabled }; }) };
    },
  };

  async function restartBenches(rows: BenchRow[]): Promise<void> {
    const manager = deps.manager();
    if (!manager) return;
    for (const bench of rows) await manager.apply(toManaged(bench));
  }
}

/** The gateway service's type. */
export type GatewayService = ReturnType<typeof createGatewayService>;
