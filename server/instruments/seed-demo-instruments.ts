import { QueryTypes, type Sequelize } from 'sequelize';
import { InstrumentInputSchema, type InstrumentInput } from '../../shared/schemas/instrument.js';
import { InstrumentsRepo, localToday } from './instruments-repo.js';

const MS_PER_DAY = 86_400_000;
/** A calibration interval of one year (common practice for bench meters). */
const CALIBRATION_INTERVAL_DAYS = 365;

/** A day relative to `now`, YYYY-MM-DD. */
const dayFrom = (now: Date, offsetDays: number) => localToday(new Date(now.getTime() + offsetDays * MS_PER_DAY));

/**
 * The demo lab's instruments (fictional makers): Bench A's meter in date, with identity
 * corrections so the demo's readings stay the simulator's; Bench B's electronic load past its
 * due date, so the demo shows the flag. Added only when the lab has no records and the benches exist.
 */
export async function seedDemoInstruments(sequelize: Sequelize, now = new Date()): Promise<number> {
  const [{ count }] = await sequelize.query<{ count: number }>('SELECT COUNT(*) AS count FROM instruments', { type: QueryTypes.SELECT });
  if (Number(count) > 0) return 0;
  const benches = await sequelize.query<{ id: number; name: string }>('SELECT id, name FROM benches ORDER BY id', { type: QueryTypes.SELECT });
  const benchA = benches.find((b) => b.name.startsWith('Bench A'))?.id ?? null;
  const benchB = benches.find((b) => b.name.startsWith('Bench B'))?.id ?? null;
  const records: InstrumentInput[] = [
    InstrumentInputSchema.parse({
      kind: 'meter', make: 'Ostwind Labs', model: 'DM-6 bench meter', serialNumber: 'OW-20931', benchId: benchA,
      calibratedOn: dayFrom(now, -120), calibrationDueOn: dayFrom(now, CALIBRATION_INTERVAL_DAYS - 120),
      channels: { volts: { gain: 1, offset: 0 }, amps: { gain: 1, offset: 0 } },
      notes: 'Demo record: the certificate found no correction needed.',
    }),
    InstrumentInputSchema.parse({
      kind: 'load', make: 'Ostwind Labs', model: 'EL-300 electronic load', serialNumber: 'OW-L0457', benchId: benchB,
      calibratedOn: dayFrom(now, -CALIBRATION_INTERVAL_DAYS - 30), calibrationDueOn: dayFrom(now, -30),
      notes: 'Demo record: past its due date.',
    }),
  ];
  const repo = new InstrumentsRepo(sequelize);
  for (const record of records) await repo.create(record);
  return records.length;
}
