/**
 * Command line: plays a scenario as a meter on stdout or a pseudo-terminal.
 * npm run simulator -- --scenario NAME --format csv|jsonl|scpi|modbus --out PATH|- --speed N --seed N
 */
import { parseArgs } from 'node:util';
import { z } from 'zod';
import { csvOptionsFor, MeterFormatSchema } from './meter/device.js';
import { listScenarios, loadScenario } from './scenario/registry.js';
import { startSimulatedBench } from './instruments/simulated-bench.js';
import { startPtyMeter } from './transport/pty-meter.js';
import { startStreamMeter } from './transport/stdio-meter.js';

const USAGE = `Usage: npm run simulator -- [options]
  --list                 list the built-in scenarios
  --scenario NAME|FILE   a built-in scenario name or a scenario .json file
  --format FORMAT        csv (default), jsonl, scpi or modbus
  --out PATH|-           a pseudo-terminal link to create (under /tmp), or - for stdout (default)
  --speed N              simulated seconds per real second (default 1; 60 plays an hour in a minute)
  --seed N               random seed (default 1): the same seed writes the same bytes
  --sample-period S      seconds between meter samples (default: the scenario's)
  --ideal                a perfect meter: no noise, drops, garbling or unplugs
  --no-time              CSV without the time column
  --unit-id N            Modbus unit address (default 1)
  --load PATH            also an electronic load on a pseudo-terminal at PATH (needs --out PATH)
  --supply PATH          also a supply / charger on a pseudo-terminal at PATH (needs --out PATH)
  --instruments FORMAT   how the load and supply speak: scpi (default) or modbus`;

const IDEAL_METER = { voltsNoise: 0, ampsNoise: 0, tempNoise: 0, dropProbability: 0, corruptProbability: 0, unplugs: [] };

/** Modbus serial unit addresses run from 1 to 247 (Modbus over Serial Line, §2.2). */
const MAX_MODBUS_UNIT = 247;

const ArgsSchema = z.object({
  list: z.boolean().default(false),
  help: z.boolean().default(false),
  scenario: z.string().optional(),
  format: MeterFormatSchema.default('csv'),
  out: z.string().default('-'),
  speed: z.coerce.number().positive().finite().default(1),
  seed: z.coerce.number().int().nonnegative().default(1),
  'no-time': z.boolean().default(false),
  'sample-period': z.coerce.number().positive().finite().optional(),
  ideal: z.boolean().default(false),
  'unit-id': z.coerce.number().int().min(1).max(MAX_MODBUS_UNIT).default(1),
  load: z.string().optional(),
  supply: z.string().optional(),
  instruments: z.enum(['scpi', 'modbus']).default('scpi'),
});

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      list: { type: 'boolean' }, help: { type: 'boolean' }, scenario: { type: 'string' },
      format: { type: 'string' }, out: { type: 'string' }, speed: { type: 'string' },
      seed: { type: 'string' }, 'no-time': { type: 'boolean' }, 'unit-id': { type: 'string' },
      'sample-period': { type: 'string' }, ideal: { type: 'boolean' },
      load: { type: 'string' }, supply: { type: 'string' }, instruments: { type: 'string' },
    },
  });
  const parsed = ArgsSchema.safeParse(values);
  if (!parsed.success) throw new Error(parsed.error.issues.map((i) => `--${i.path.join('.')}: ${i.message}`).join('\n'));
  const args = parsed.data;
  if (args.help) return void console.log(USAGE);
  if (args.list) {
    for (const s of listScenarios()) console.log(`${s.name}\n    ${s.title}`);
    return;
  }
  if (!args.scenario) throw new Error(`--scenario is required\n${USAGE}`);
  const scenario = loadScenario(args.scenario);
  const common = {
    scenario,
    format: args.format,
    speed: args.speed,
    seed: args.seed,
    csv: csvOptionsFor(scenario, !args['no-time']),
    meter: {
      ...(args['sample-period'] ? { readingPeriodSeconds: args['sample-period'] } : {}),
      ...(args.ideal ? IDEAL_METER : {}),
    },
    modbus: { unitId: args['unit-id'] },
  };
  const withInstruments = args.load !== undefined || args.supply !== undefined;
  if (withInstruments && args.out === '-') throw new Error('--load and --supply need the meter on a pseudo-terminal too: give --out PATH');
  if (withInstruments) {
    const bench = await startSimulatedBench({ ...common, linkPath: args.out, loadLinkPath: args.load, supplyLinkPath: args.supply, protocol: args.instruments });
    console.error(`Simulated ${args.format} meter on ${args.out}; ${args.instruments} load on ${args.load ?? '(none)'}, supply on ${args.supply ?? '(none)'} (scenario ${scenario.name}, ${args.speed}x)`);
    process.once('SIGINT', () => void bench.stop());
    process.once('SIGTERM', () => void bench.stop());
    await bench.meter.finished;
    await bench.stop();
    return;
  }
  if (args.out === '-') {
    const meter = startStreamMeter({ ...common, output: process.stdout, input: process.stdin });
    process.once('SIGINT', () => meter.stop());
    await meter.finished;
    process.stdin.pause();
    return;
  }
  const meter = await startPtyMeter({ ...common, linkPath: args.out });
  console.error(`Simulated ${args.format} meter on ${meter.path} (scenario ${scenario.name}, ${args.speed}x, seed ${args.seed})`);
  process.once('SIGINT', () => void meter.stop());
  process.once('SIGTERM', () => void meter.stop());
  await meter.finished;
  await meter.stop();
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exitCode = 1;
});
