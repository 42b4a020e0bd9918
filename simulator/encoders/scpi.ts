import type { Frame } from '../../shared/schemas/frame.js';
import { HEATER_AMPS_CHANNEL } from '../../shared/schemas/frame.js';

/** SCPI's "not a number" (IEEE 488.2 / SCPI-99): what a meter answers before its first reading. */
export const SCPI_NAN = '9.91E+37';
/** Temperature channels in (@n) order: 1 = the pack's cell sensor, 2 = ambient. */
export const SCPI_TEMP_CHANNELS = ['cell', 'ambient'] as const;
export const DEFAULT_IDN = 'Kneepoint,KP-SIM-1,SIM000001,0.1';
/** Fields of a FETCh? / READ? reply, comma-separated in this order. */
export const SCPI_FETCH_FIELDS = ['t', 'volts', 'amps', 'temp:cell', 'temp:ambient', 'aux:heaterAmps', 'seq'] as const;
const MAX_LINE_CHARS = 256;
const MAX_ERROR_QUEUE = 10;

interface Command {
  /** SCPI header with the optional part in lower case and optional nodes in brackets. */
  pattern: RegExp;
  run(channel: number | undefined, frame: Frame | undefined): string | undefined;
}

const num = (value: number | undefined): string => (value === undefined ? SCPI_NAN : String(value));

/** What may follow a query header: a channel list `(@n)`, captured. */
const CHANNEL_TAIL = '(?:\\s+\\(@(\\d+)\\))?';

/**
 * Builds a regex accepting the short form, the long form and optional [:NODE]s of a SCPI
 * header, followed by `tail` (by default an optional channel list).
 */
export function header(spec: string, tail = CHANNEL_TAIL): RegExp {
  const query = spec.endsWith('?');
  const parts = (query ? spec.slice(0, -1) : spec).match(/\[:[^\]]+\]|:?[^:[]+/g) ?? [];
  const body = parts
    .map((part, index) => {
      const node = part.replace(/[[\]:]/g, '');
      const short = /^[A-Z*]+/.exec(node)?.[0] ?? node;
      const rest = node.slice(short.length).toUpperCase();
      const separator = index === 0 ? ':?' : ':';
      const pattern = `${separator}${short.replace('*', '\\*')}${rest ? `(?:${rest})?` : ''}`;
      return part.startsWith('[') ? `(?:${pattern})?` : pattern;
    })
    .join('');
  return new RegExp(`^${body}${query ? '\\?' : ''}${tail}$`, 'i');
}

function commands(idn: string): Command[] {
  const temp = (frame: Frame | undefined, channel = 1) => frame?.temps?.[SCPI_TEMP_CHANNELS[channel - 1] ?? ''];
  return [
    { pattern: header('*IDN?'), run: () => idn },
    { pattern: header('MEASure[:SCALar]:VOLTage[:DC]?'), run: (_c, f) => num(f?.volts) },
    // (@1) is the pack current (positive = discharge); (@2) the heater pad's current.
    { pattern: header('MEASure[:SCALar]:CURRent[:DC]?'), run: (c, f) => num(c === 2 ? f?.aux?.[HEATER_AMPS_CHANNEL] : f?.amps) },
    { pattern: header('MEASure[:SCALar]:TEMPerature?'), run: (c, f) => num(temp(f, c)) },
    { pattern: header('FETCh?'), run: (_c, f) => fetch(f) },
    { pattern: header('READ?'), run: (_c, f) => fetch(f) },
  ];
}

function fetch(frame: Frame | undefined): string {
  if (!frame) return SCPI_FETCH_FIELDS.map(() => SCPI_NAN).join(',');
  return [frame.t, frame.volts, frame.amps, frame.temps?.cell, frame.temps?.ambient, frame.aux?.[HEATER_AMPS_CHANNEL], frame.seq]
    .map(num)
    .join(',');
}

/** A SCPI instrument: holds its latest reading and answers query lines. */
export interface ScpiInstrument {
  /** Stores the newest reading (the instrument's measurement). */
  update(frame: Frame): void;
  /** Feeds received bytes; returns the reply lines (each ending in \n) for complete commands. */
  receive(text: string): string[];
}

/** Creates a SCPI instrument; unknown headers go to the error queue (-113), read with SYST:ERR?. */
export function createScpiInstrument(idn = DEFAULT_IDN): ScpiInstrument {
  const table = commands(idn);
  const errors: string[] = [];
  let latest: Frame | undefined;
  let pending = '';
  const pushError = (error: string) => {
    if (errors.length < MAX_ERROR_QUEUE) errors.push(error);
  };
  const execute = (text: string): string | undefined => {
    if (/^\*RST$|^\*CLS$/i.test(text)) {
      errors.length = 0;
      return undefined;
    }
    if (/^SYST(?:EM)?:ERR(?:OR)?(?::NEXT)?\?$/i.test(text)) return errors.shift() ?? '0,"No error"';
    const match = table.map((c) => ({ c, m: c.pattern.exec(text) })).find((x) => x.m);
    if (!match?.m) {
      pushError('-113,"Undefined header"');
      return undefined;
    }
    const channel = match.m[1] ? Number(match.m[1]) : undefined;
    return match.c.run(channel, latest);
  };
  return {
    update(frame) {
      latest = frame;
    },
    receive(text) {
      pending += text;
      const replies: string[] = [];
      let newline = pending.indexOf('\n');
      while (newline >= 0) {
        const line = pending.slice(0, newline).trim();
        pending = pending.slice(newline + 1);
        // Several commands on one line are separated by semicolons (IEEE 488.2).
        const answers = line.split(';').map((c) => c.trim()).filter(Boolean).map(execute).filter((a) => a !== undefined);
        if (answers.length > 0) replies.push(`${answers.join(';')}\n`);
        newline = pending.indexOf('\n');
      }
      // A line that never ends must not grow without bound.
      if (pending.length > MAX_LINE_CHARS) {
        pending = '';
        pushError('-112,"Program mnemonic too long"');
      }
      return replies;
    },
  };
}
