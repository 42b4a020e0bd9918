import { QueryTypes, type Sequelize } from 'sequelize';
import type { ShareLink, ShareOpeningWhat, ShareTargetKind } from '../../shared/schemas/share.js';
import { utcDateTime } from '../db/utc-datetime.js';

/** A stored link row (the token itself is never stored). */
interface LinkRow {
  id: number;
  tokenHash: string;
  targetKind: ShareTargetKind;
  targetId: number;
  includePrices: number | boolean;
  recipient: string | null;
  createdByName: string;
  createdAt: Date | string;
  expiresAt: Date | string;
  revokedAt: Date | string | null;
  revokedByName: string | null;
  openings?: number | string;
}

/** A link found by its token hash, with what the shared page needs to know. */
export interface ActiveLink {
  id: number;
  kind: ShareTargetKind;
  targetId: number;
  includePrices: boolean;
  expiresAt: string;
}

const iso = (d: Date | string) => new Date(d).toISOString();

const toLink = (row: LinkRow, nowMs: number): ShareLink => ({
  id: row.id,
  kind: row.targetKind,
  targetId: row.targetId,
  includePrices: Boolean(row.includePrices),
  recipient: row.recipient,
  createdByName: row.createdByName,
  createdAt: iso(row.createdAt),
  expiresAt: iso(row.expiresAt),
  revokedAt: row.revokedAt === null ? null : iso(row.revokedAt),
  revokedByName: row.revokedByName,
  state: row.revokedAt !== null ? 'revoked' : new Date(row.expiresAt).getTime() <= nowMs ? 'expired' : 'active',
  openings: Number(row.openings ?? 0),
});

const LINK_SELECT = `SELECT l.*, (SELECT COUNT(*) FROM share_link_openings o WHERE o.linkId = l.id) AS openings FROM share_links l`;

/** New link fields. */
export interface NewShareLink {
  tokenHash: string;
  kind: ShareTargetKind;
  targetId: number;
  includePrices: boolean;
  recipient: string | null;
  createdById: number;
  createdByName: string;
  expiresAt: Date;
}

/** Data access for share links and their openings. */
export class ShareRepo {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly now: () => number = Date.now,
  ) {}

  /** Stores a link and returns it. */
  async create(link: NewShareLink): Promise<ShareLink> {
    const [id] = await this.sequelize.query(
      `INSERT INTO share_links (tokenHash, targetKind, targetId, includePrices, recipient, createdById, createdByName, createdAt, expiresAt)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      {
        replacements: [link.tokenHash, link.kind, link.targetId, link.includePrices, link.recipient, link.createdById, link.createdByName, utcDateTime(new Date(this.now())), utcDateTime(link.expiresAt)],
        type: QueryTypes.INSERT,
      },
    );
    return (await this.get(Number(id)))!;
  }

  /** One link by id, or null. */
  async get(id: number): Promise<ShareLink | null> {
    const [row] = await this.sequelize.query<LinkRow>(`${LINK_SELECT} WHERE l.id = ?`, { replacements: [id], type: QueryTypes.SELECT });
    return row ? toLink(row, this.now()) : null;
  }

  /** Every link to one run or pack, newest first. */
  async ofTarget(kind: ShareTargetKind, targetId: number): Promise<ShareLink[]> {
    const rows = await this.sequelize.query<LinkRow>(`${LINK_SELECT} WHERE l.targetKind = ? AND l.targetId = ? ORDER BY l.id DESC`, {
      replacements: [kind, targetId],
      type: QueryTypes.SELECT,
    });
    return rows.map((row) => toLink(row, this.now()));
  }

  /** The link a token opens, or null when unknown, expired or revoked. */
  async active(tokenHash: string): Promise<ActiveLink | null> {
    const [row] = await this.sequelize.query<LinkRow>('SELECT * FROM share_links WHERE tokenHash = ?', { replacements: [tokenHash], type: QueryTypes.SELECT });
    if (!row || toLink(row, this.now()).state !== 'active') return null;
    return { id: row.id, kind: row.targetKind, targetId: row.targetId, includePrices: Boolean(row.includePrices), expiresAt: iso(row.expiresAt) };
  }

  /** Revokes a link (a second revoke keeps the first time and name). */
  async revoke(id: number, byName: string): Promise<ShareLink | null> {
    await this.sequelize.query('UPDATE share_links SET revokedAt = ?, revokedByName = ? WHERE id = ? AND revokedAt IS NULL', {
      replacements: [utcDateTime(new Date(this.now())), byName, id],
    });
    return this.get(id);
  }

  /** Logs one opening of the report page or its PDF. */
  async logOpening(linkId: number, addressHash: string, userAgent: string, what: ShareOpeningWhat = 'page'): Promise<void> {
    await this.sequelize.query('INSERT INTO share_link_openings (linkId, openedAt, addressHash, userAgent, what) VALUES (?, ?, ?, ?, ?)', {
      replacements: [linkId, utcDateTime(new Date(this.now())), addressHash, userAgent, what],
      type: QueryTypes.INSERT,
    });
  }

  /** Openings of a link, newest first. */
  async openings(linkId: number): Promise<Array<{ openedAt: string; addressHash: string; userAgent: string; what: ShareOpeningWhat }>> {
    const rows = await this.sequelize.query<{ openedAt: Date | string; addressHash: string; userAgent: string; what: ShareOpeningWhat }>(
      'SELECT openedAt, addressHash, userAgent, what FROM share_link_openings WHERE linkId = ? ORDER BY id DESC',
      { replacements: [linkId], type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({ openedAt: iso(r.openedAt), addressHash: r.addressHash, userAgent: r.userAgent, what: r.what }));
  }
}
