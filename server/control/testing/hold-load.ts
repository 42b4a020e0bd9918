/**
 * A stand-in for the server in the watchdog test: opens the simulated load at argv[2], sets
 * CC 5 A, switches the input on, arms the load's watchdog for argv[3] seconds and keeps talking
 * (a read every 200 ms) until it is killed. Prints "armed" once all that is done.
 */
import { SIM_LOAD_SCPI } from '../../../shared/schemas/instrument-presets.js';
import { openInstrument } from '../open-instrument.js';

const POLL_MS = 200;
const [path, watchdogSeconds] = process.argv.slice(2);
const load = await openInstrument({ protocol: 'scpi', id: 'load', role: 'load', port: { path }, commands: SIM_LOAD_SCPI });
await load.set({ mode: 'cc', value: 5 });
await load.setOutput(true);
await load.armWatchdog(Number(watchdogSeconds));
process.stdout.write('armed\n');
const timer = setInterval(() => void load.read().catch((err: unknown) => process.stderr.write(`${String(err)}\n`)), POLL_MS);
process.on('SIGTERM', () => clearInterval(timer));
