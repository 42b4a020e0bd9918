import { header } from '../encoders/scpi.js';
import type { SimInstrument, SimMode } from './sim-instrument.js';

const MAX_LINE_CHARS = 256;
const MAX_ERROR_QUEUE = 10;
/** What a broken instrument sends instead of an answer: control bytes and 8-bit noise. */
export const GARBAGE_REPLY = '\u0015\u00fe#?\u0007\u00a9\n';
/** SCPI-1999 error codes (from memory): command errors −1xx, execution errors −2xx. */
const ERR = {
  undefinedHeader: '-113,"Undefined header"',
  dataType: '-104,"Data type error"',
  outOfRange: '-222,"Data out of range"',
  settingsConflict: '-221,"Settings conflict"',
  tooLong: '-112,"Program mnemonic too long"',
};

const FUNCTION_WORDS: [RegExp, SimMode][] = [
  [/^CURR(?:ENT)?$/i, 'cc'],
  [/^POW(?:ER)?$/i, 'cp'],
  [/^RES(?:ISTANCE)?$/i, 'cr'],
  [/^VOLT(?:AGE)?$/i, 'cv'],
];
const ARG = '\\s+(\\S+)';

/** The SCPI side of a simulated load or supply: parses lines, drives the instrument, answers queries. */
export interface ScpiControl {
  /** Feeds received text; returns what the instrument sends back. */
  receive(text: string): string[];
}

/** Builds the SCPI command handler; the input/output word is INP for a load and OUTP for a supply. */
export function createScpiControl(instrument: SimInstrument): ScpiControl {
  const errors: string[] = [];
  let pending = '';
  const pushError = (error: string) => {
    if (errors.length < MAX_ERROR_QUEUE) errors.push(error);
  };
  const output = instrument.spec.role === 'load' ? 'INPut[:STATe]' : 'OUTPut[:STATe]';
  const number = (text: string, max: number): number | undefined => {
    const value = Number(text);
    if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(text) || !Number.isFinite(value)) return void pushError(ERR.dataType);
    if (value < 0 || value > max) return void pushError(ERR.outOfRange);
    return value;
  };
  const setValue = (mode: SimMode, text: string, max: number) => {
    const value = number(text, max);
    if (value === undefined) return;
    // A supply's CURRent is its current limit in CV and its set current in CC: one setting.
    if (!instrument.spec.modes.includes(mode) && !(mode === 'cc' && instrument.spec.role === 'supply')) return pushError(ERR.settingsConflict);
    instrument.setValue(mode, value);
  };
  const { maxAmps, maxVolts } = instrument.spec;
  const maxWatts = maxAmps * maxVolts;
  const table: [RegExp, (arg: string) => string | undefined][] = [
    [header('*IDN?'), () => instrument.spec.idn],
    [header('*OPC?'), () => '1'],
    [/^\*RST$/i, () => void (instrument.reset(), (errors.length = 0))],
    [/^\*CLS$/i, () => void (errors.length = 0)],
    [header('SYSTem:ERRor[:NEXT]?'), () => errors.shift() ?? '0,"No error"'],
    [header('SYSTem:WDOG', ARG), (a) => {
      const seconds = number(a, Number.MAX_SAFE_INTEGER);
      if (seconds !== undefined) instrument.armWatchdog(seconds);
      return undefined;
    }],
    [header('SYSTem:WDOG?'), () => String(instrument.watchdogS)],
    [header('FUNCtion', ARG), (a) => {
      const mode = FUNCTION_WORDS.find(([word]) => word.test(a))?.[1];
      if (mode === undefined) return void pushError(ERR.dataType);
      if (!instrument.spec.modes.includes(mode)) return void pushError(ERR.settingsConflict);
      instrument.setMode(mode);
      return undefined;
    }],
    [header('FUNCtion?'), () => ({ cc: 'CURR', cp: 'POW', cr: 'RES', cv: 'VOLT' })[instrument.mode]],
    [header('CURRent[:LEVel]', ARG), (a) => void setValue('cc', a, maxAmps)],
    [header('POWer[:LEVel]', ARG), (a) => void setValue('cp', a, maxWatts)],
    [header('RESistance[:LEVel]', ARG), (a) => void setValue('cr', a, Number.MAX_SAFE_INTEGER)],
    [header('VOLTage[:LEVel]', ARG), (a) => void setValue('cv', a, maxVolts)],
    [header('CURRent[:LEVel]?'), () => String(instrument.values.cc)],
    [header('VOLTage[:LEVel]?'), () => String(instrument.values.cv)],
    [header(output, ARG), (a) => {
      const word = a.toUpperCase();
      if (word === 'ON' || word === '1') instrument.setOutput(true);
      else if (word === 'OFF' || word === '0') instrument.setOutput(false);
      else pushError(ERR.dataType);
      return undefined;
    }],
    [header(`${output}?`), () => (instrument.outputOn ? '1' : '0')],
    [header('MEASure[:SCALar]:VOLTage[:DC]?'), () => instrument.volts.toFixed(4)],
    [header('MEASure[:SCALar]:CURRent[:DC]?'), () => instrument.amps.toFixed(4)],
  ];

  const execute = (text: string): string | undefined => {
    for (const [pattern, run] of table) {
      const match = pattern.exec(text);
      if (match) return run(match[1] ?? '');
    }
    pushError(ERR.undefinedHeader);
    return undefined;
  };

  return {
    receive(text) {
      if (instrument.fault === 'silent') return [];
      pending += text;
      const replies: string[] = [];
      for (let newline = pending.indexOf('\n'); newline >= 0; newline = pending.indexOf('\n')) {
        const line = pending.slice(0, newline).trim();
        pending = pending.slice(newline + 1);
        if (line === '') continue;
        if (instrument.fault === 'garbage') {
          replies.push(GARBAGE_REPLY);
          continue;
        }
        instrument.touch();
        // Several commands on one line are separated by semicolons (IEEE 488.2).
        const answers = line.split(';').map((c) => c.trim()).filter(Boolean).map(execute).filter((a) => a !== undefined);
        if (answers.length > 0) replies.push(`${answers.join(';')}\n`);
      }
      // A line that never ends must not grow without bound.
      if (pending.length > MAX_LINE_CHARS) {
        pending = '';
        pushError(ERR.tooLong);
      }
      return replies;
    },
  };
}
