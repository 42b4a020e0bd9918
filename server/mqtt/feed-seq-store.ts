import { QueryTypes, type Sequelize } from 'sequelize';

/** Where the link keeps the last feed `seq` it took per bench (table `gateway_feed_seqs`, migration 1740). */
export interface FeedSeqStore {
  /** Every bench's last taken `seq`. */
  load(): Promise<Map<number, number>>;
  /** Stores these benches' last taken `seq` (others are left as they are). */
  save(seqs: ReadonlyMap<number, number>): Promise<void>;
}

/** The feed-seq store on the server's database. */
export function sqlFeedSeqStore(sequelize: Sequelize): FeedSeqStore {
  return {
    async load() {
      const rows = await sequelize.query<{ benchId: number; lastSeq: number | string | bigint }>('SELECT benchId, lastSeq FROM gateway_feed_seqs', { type: QueryTypes.SELECT });
      return new Map(rows.map((r) => [Number(r.benchId), Number(r.lastSeq)]));
    },
    async save(seqs) {
      if (seqs.size === 0) return;
      const values = [...seqs].flatMap(([benchId, seq]) => [benchId, seq]);
      const rows = [...seqs].map(() => '(?, ?, NOW(3))').join(', ');
      // One statement: every bench's seq moves together.
      await sequelize.query(`INSERT INTO gateway_feed_seqs (benchId, lastSeq, updatedAt) VALUES ${rows} ON DUPLICATE KEY UPDATE lastSeq = VALUES(lastSeq), updatedAt = VALUES(updatedAt)`, { replacements: values });
    },
  };
}
