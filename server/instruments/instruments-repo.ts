import { QueryTypes, type Sequelize } from 'sequelize';
import { calibrationState } from '../../shared/measure/calibration.js';
import {
  ChannelCorrectionsSchema,
  RunInstrumentSchema,
  type Instrument,
  type InstrumentInput,
  type RunInstrument,
} from '../../shared/schemas/instrument.js';

/** A row as MariaDB returns it (dates already formatted as YYYY-MM-DD by the query). */
interface Row {
  id: number;
  kind: Instrument['kind'];
  make: string;
  model: string;
  serialNumber: string;
  calibratedOn: string | null;
  calibrationDueOn: string | null;
  benchId: number | null;
  channels: string;
  notes: string;
  certificateFile: string | null;
  certificateName: string | null;
  certificateType: string | null;
  certificateBytes: number | null;
  certificateUploadedAt: Date | string | null;
  updatedAt: Date | string;
}

/** The stored certificate file of a record. */
export interface StoredCertificate {
  file: string;
  name: string;
  contentType: string;
}

const SELECT = `SELECT id, kind, make, model, serialNumber,
  DATE_FORMAT(calibratedOn, '%Y-%m-%d') AS calibratedOn, DATE_FORMAT(calibrationDueOn, '%Y-%m-%d') AS calibrationDueOn,
  benchId, channels, notes, certificateFile, certificateName, certificateType, certificateBytes, certificateUploadedAt, updatedAt
  FROM instruments`;

const iso = (d: Date | string) => new Date(d).toISOString();

/** Today as YYYY-MM-DD on the server's calendar (the lab's, where the server runs). */
export function localToday(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}

function toInstrument(row: Row, today: string): Instrument {
  return {
    id: row.id,
    kind: row.kind,
    make: row.make,
    model: row.model,
    serialNumber: row.serialNumber,
    calibratedOn: row.calibratedOn,
    calibrationDueOn: row.calibrationDueOn,
    benchId: row.benchId,
    channels: ChannelCorrectionsSchema.parse(JSON.parse(row.channels)),
    notes: row.notes,
    certificate:
      row.certificateFile === null
        ? null
        : { fileName: row.certificateName ?? 'certificate', contentType: row.certificateType ?? 'application/octet-stream', sizeBytes: row.certificateBytes ?? 0, uploadedAt: iso(row.certificateUploadedAt ?? row.updatedAt) },
    calibration: calibrationState(row.calibrationDueOn, today),
    updatedAt: iso(row.updatedAt),
  };
}

/** Instrument records and the instruments each run used. */
export class InstrumentsRepo {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly today: () => string = () => localToday(),
  ) {}

  /** Every record, or those on one bench, by id. */
  async list(benchId?: number): Promise<Instrument[]> {
    const rows = await this.sequelize.query<Row>(`${SELECT} ${benchId === undefined ? '' : 'WHERE benchId = :benchId'} ORDER BY id`, {
      type: QueryTypes.SELECT,
      replacements: { benchId: benchId ?? null },
    });
    const today = this.today();
    return rows.map((r) => toInstrument(r, today));
  }

  /** One record, or null. */
  async get(id: number): Promise<Instrument | null> {
    const [row] = await this.sequelize.query<Row>(`${SELECT} WHERE id = :id`, { type: QueryTypes.SELECT, replacements: { id } });
    return row ? toInstrument(row, this.today()) : null;
  }

  /** Creates a record; returns it. */
  async create(input: InstrumentInput): Promise<Instrument> {
    const now = new Date();
    const [id] = await this.sequelize.query(
      `INSERT INTO instruments (kind, make, model, serialNumber, calibratedOn, calibrationDueOn, benchId, channels, notes, createdAt, updatedAt)
       VALUES (:kind, :make, :model, :serialNumber, :calibratedOn, :calibrationDueOn, :benchId, :channels, :notes, :now, :now)`,
      { type: QueryTypes.INSERT, replacements: { ...input, channels: JSON.stringify(input.channels), now } },
    );
    return (await this.get(Number(id)))!;
  }

  /** Replaces a record's fields (the certificate stays); null when there is no such record. */
  async update(id: number, input: InstrumentInput): Promise<Instrument | null> {
    await this.sequelize.query(
      `UPDATE instruments SET kind = :kind, make = :make, model = :model, serialNumber = :serialNumber, calibratedOn = :calibratedOn,
       calibrationDueOn = :calibrationDueOn, benchId = :benchId, channels = :channels, notes = :notes, updatedAt = :now WHERE id = :id`,
      { replacements: { ...input, channels: JSON.stringify(input.channels), now: new Date(), id } },
    );
    return this.get(id);
  }

  /** Removes a record; returns its certificate file to delete, or undefined when there was no record. */
  async remove(id: number): Promise<{ certificateFile: string | null } | undefined> {
    const [row] = await this.sequelize.query<{ certificateFile: string | null }>('SELECT certificateFile FROM instruments WHERE id = :id', { type: QueryTypes.SELECT, replacements: { id } });
    if (!row) return undefined;
    await this.sequelize.query('DELETE FROM instruments WHERE id = :id', { replacements: { id } });
    return row;
  }

  /** The stored certificate of a record, or null. */
  async certificate(id: number): Promise<StoredCertificate | null> {
    const [row] = await this.sequelize.query<Row>(`${SELECT} WHERE id = :id`, { type: QueryTypes.SELECT, replacements: { id } });
    if (!row?.certificateFile) return null;
    return { file: row.certificateFile, name: row.certificateName ?? 'certificate', contentType: row.certificateType ?? 'application/octet-stream' };
  }

  /** Points a record at a new certificate file; returns the file it replaces (to delete). */
  async setCertificate(id: number, file: string, name: string, contentType: string, sizeBytes: number): Promise<string | null> {
    const previous = await this.certificate(id);
    await this.sequelize.query(
      `UPDATE instruments SET certificateFile = :file, certificateName = :name, certificateType = :contentType, certificateBytes = :sizeBytes,
       certificateUploadedAt = :now, updatedAt = :now WHERE id = :id`,
      { replacements: { id, file, name, contentType, sizeBytes, now: new Date() } },
    );
    return previous?.file ?? null;
  }

  /** Freezes the bench's instruments, with their calibration state today, onto a run (once per run and instrument). */
  async recordRun(runId: number, benchId: number): Promise<RunInstrument[]> {
    const used = (await this.list(benchId)).map(
      (i): RunInstrument => ({
        instrumentId: i.id, kind: i.kind, make: i.make, model: i.model, serialNumber: i.serialNumber,
        calibratedOn: i.calibratedOn, calibrationDueOn: i.calibrationDueOn, calibration: i.calibration, channels: i.channels,
      }),
    );
    for (const snapshot of used) {
      await this.sequelize.query(
        'INSERT IGNORE INTO run_instruments (runId, instrumentId, snapshot, createdAt) VALUES (:runId, :instrumentId, :snapshot, :now)',
        { replacements: { runId, instrumentId: snapshot.instrumentId, snapshot: JSON.stringify(snapshot), now: new Date() } },
      );
    }
    return used;
  }

  /** The instruments a run used, as they were when it started. */
  async ofRun(runId: number): Promise<RunInstrument[]> {
    const rows = await this.sequelize.query<{ snapshot: string }>('SELECT snapshot FROM run_instruments WHERE runId = :runId ORDER BY instrumentId', {
      type: QueryTypes.SELECT,
      replacements: { runId },
    });
    return rows.map((r) => RunInstrumentSchema.parse(JSON.parse(r.snapshot)));
  }
}
