import { decodeRegisterValue, encodeRegisterValue, wordsOf } from '../../shared/modbus/register-value.js';
import { InstrumentRegisterMapSchema, type InstrumentRegisterMap } from '../../shared/schemas/instrument-driver.js';
import { SIM_INSTRUMENT_REGISTERS } from '../../shared/schemas/instrument-presets.js';
import { hasValidCrc, withCrc } from '../encoders/modbus/crc16.js';
import { GARBAGE_REPLY } from './scpi-control.js';
import type { SimInstrument, SimMode } from './sim-instrument.js';

/** Modbus Application Protocol V1.1b3 function codes and exception codes (section 6 and 7). */
const READ_HOLDING = 0x03;
const READ_INPUT = 0x04;
const WRITE_SINGLE = 0x06;
const WRITE_MULTIPLE = 0x10;
const EXCEPTION_FLAG = 0x80;
const ILLEGAL_FUNCTION = 0x01;
const ILLEGAL_ADDRESS = 0x02;
const ILLEGAL_VALUE = 0x03;
/** Read 1 to 125 registers, write 1 to 123 (V1.1b3, 6.3 and 6.12). */
const MAX_READ = 125;
const MAX_WRITE = 123;
/** Address, function, start (2), quantity or value (2), CRC (2). */
const FIXED_REQUEST_BYTES = 8;
/** Write multiple: the fixed part, a byte count, then the data. */
const WRITE_MULTIPLE_HEADER_BYTES = 7;
const CRC_BYTES = 2;
const MAX_BUFFER_BYTES = 256;
/** The instrument's own error codes in its error register. */
export const SIM_MODBUS_ERRORS = { modeUnavailable: 1, outOfRange: 2 } as const;

/** The Modbus side of a simulated load or supply. */
export interface ModbusControl {
  /** Feeds received bytes; returns the responses to complete requests for this unit. */
  receive(bytes: Uint8Array): Uint8Array[];
}

/**
 * A Modbus RTU slave over the instrument's register map: functions 03/04 read the image
 * (mode, set values, output, watchdog, error code, measurements, identity), 06 and 16 write.
 * A write the instrument refuses (a mode it lacks, a value past its limits) is still
 * acknowledged, as most instruments do, and leaves an error code to read.
 */
export function createModbusControl(instrument: SimInstrument, unitId = 1, mapInput = SIM_INSTRUMENT_REGISTERS): ModbusControl {
  const map: InstrumentRegisterMap = InstrumentRegisterMapSchema.parse(mapInput);
  let errorCode = 0;
  let buffer = new Uint8Array(0);
  const valueSpecs = Object.entries(map.setValue) as [SimMode, NonNullable<InstrumentRegisterMap['setValue'][SimMode]>][];
  const identity = map.identity;

  /** Every mapped quantity and its current value (engineering units). */
  const fields = () => {
    const list: { spec: { address: number; type: 'u16' | 'i16' | 'u32' | 'i32' | 'f32'; scale: number; offset: number; wordOrder: 'high-first' | 'low-first' }; value: number }[] = [];
    const codes = map.mode.codes;
    list.push({ spec: map.mode, value: codes[instrument.mode] ?? 0 });
    for (const [mode, spec] of valueSpecs) list.push({ spec, value: instrument.values[mode] });
    if (map.currentLimit) list.push({ spec: map.currentLimit, value: instrument.values.cc });
    list.push({ spec: map.output, value: instrument.outputOn ? 1 : 0 });
    if (map.watchdog) list.push({ spec: map.watchdog, value: instrument.watchdogS });
    if (map.errorCode) list.push({ spec: map.errorCode, value: errorCode });
    list.push({ spec: map.volts, value: instrument.volts }, { spec: map.amps, value: instrument.amps });
    return list;
  };

  const image = (): Map<number, number> => {
    const words = new Map<number, number>();
    for (const { spec, value } of fields()) encodeRegisterValue(value, spec).forEach((w, i) => words.set(spec.address + i, w));
    if (map.reset) words.set(map.reset.address, 0);
    if (identity) {
      const text = instrument.spec.idn.padEnd(identity.count * 2, '\0').slice(0, identity.count * 2);
      for (let i = 0; i < identity.count; i += 1) words.set(identity.address + i, (text.charCodeAt(2 * i) << 8) | text.charCodeAt(2 * i + 1));
    }
    return words;
  };

  /** Applies written registers; a quantity is taken once all its words are in the write. */
  const write = (start: number, words: number[]): boolean => {
    const at = new Map(words.map((w, i) => [start + i, w]));
    const known = image();
    if ([...at.keys()].some((a) => !known.has(a))) return false;
    const take = (spec: { address: number; type: 'u16' | 'i16' | 'u32' | 'i32' | 'f32' }) => {
      const parts = Array.from({ length: wordsOf(spec.type) }, (_, i) => at.get(spec.address + i));
      return parts.every((p) => p !== undefined) ? decodeRegisterValue(parts as number[], spec) : undefined;
    };
    const modeCode = take(map.mode);
    if (modeCode !== undefined) {
      const mode = (Object.entries(map.mode.codes) as [SimMode, number][]).find(([, code]) => code === modeCode)?.[0];
      if (mode && instrument.spec.modes.includes(mode)) instrument.setMode(mode);
      else errorCode = SIM_MODBUS_ERRORS.modeUnavailable;
    }
    const limit = (mode: SimMode) => (mode === 'cc' ? instrument.spec.maxAmps : mode === 'cv' ? instrument.spec.maxVolts : mode === 'cp' ? instrument.spec.maxAmps * instrument.spec.maxVolts : Number.MAX_SAFE_INTEGER);
    const setValue = (mode: SimMode, value: number | undefined) => {
      if (value === undefined) return;
      if (value < 0 || value > limit(mode)) errorCode = SIM_MODBUS_ERRORS.outOfRange;
      else instrument.setValue(mode, value);
    };
    for (const [mode, spec] of valueSpecs) setValue(mode, take(spec));
    if (map.currentLimit) setValue('cc', take(map.currentLimit));
    const output = take(map.output);
    if (output !== undefined) instrument.setOutput(output !== 0);
    const watchdog = map.watchdog ? take(map.watchdog) : undefined;
    if (watchdog !== undefined) instrument.armWatchdog(watchdog);
    if (map.reset && at.get(map.reset.address) === map.reset.value) {
      instrument.reset();
      errorCode = 0;
    }
    return true;
  };

  const respond = (request: Uint8Array): Uint8Array | undefined => {
    const fn = request[1];
    const exception = (code: number) => withCrc(Uint8Array.of(unitId, fn | EXCEPTION_FLAG, code));
    const start = (request[2] << 8) | request[3];
    const quantity = (request[4] << 8) | request[5];
    if (fn === READ_HOLDING || fn === READ_INPUT) {
      if (quantity < 1 || quantity > MAX_READ) return exception(ILLEGAL_VALUE);
      const words = image();
      const body = new Uint8Array(3 + quantity * 2);
      body.set([unitId, fn, quantity * 2]);
      for (let i = 0; i < quantity; i += 1) {
        const word = words.get(start + i);
        if (word === undefined) return exception(ILLEGAL_ADDRESS);
        body[3 + 2 * i] = word >> 8;
        body[4 + 2 * i] = word & 0xff;
      }
      // Reading the error register clears it (the driver's errors() drains it this way).
      if (map.errorCode && start <= map.errorCode.address && map.errorCode.address < start + quantity) errorCode = 0;
      return withCrc(body);
    }
    if (fn === WRITE_SINGLE || fn === WRITE_MULTIPLE) {
      const words = fn === WRITE_SINGLE ? [quantity] : Array.from({ length: quantity }, (_, i) => (request[7 + 2 * i] << 8) | request[8 + 2 * i]);
      if (fn === WRITE_MULTIPLE && (quantity < 1 || quantity > MAX_WRITE)) return exception(ILLEGAL_VALUE);
      if (!write(start, words)) return exception(ILLEGAL_ADDRESS);
      return withCrc(request.slice(0, 6));
    }
    return exception(ILLEGAL_FUNCTION);
  };

  /** Length of the request at the head of the buffer, or undefined until enough bytes are in. */
  const requestLength = (): number | undefined => {
    if (buffer.length < 2) return undefined;
    if (buffer[1] !== WRITE_MULTIPLE) return FIXED_REQUEST_BYTES;
    return buffer.length < WRITE_MULTIPLE_HEADER_BYTES ? undefined : WRITE_MULTIPLE_HEADER_BYTES + buffer[6] + CRC_BYTES;
  };

  return {
    receive(bytes) {
      if (instrument.fault === 'silent') return [];
      if (instrument.fault === 'garbage') return [Uint8Array.from(GARBAGE_REPLY, (c) => c.charCodeAt(0))];
      const joined = new Uint8Array(buffer.length + bytes.length);
      joined.set(buffer);
      joined.set(bytes, buffer.length);
      buffer = joined.length > MAX_BUFFER_BYTES ? joined.slice(joined.length - MAX_BUFFER_BYTES) : joined;
      const responses: Uint8Array[] = [];
      // Without timing on a pseudo-terminal, frames are found by length and CRC; a bad
      // candidate costs one byte and the hunt goes on (resynchronisation).
      for (let length = requestLength(); length !== undefined && buffer.length >= length; length = requestLength()) {
        const candidate = buffer.subarray(0, length);
        if (!hasValidCrc(candidate)) {
          buffer = buffer.slice(1);
          continue;
        }
        buffer = buffer.slice(length);
        // Other units' requests get silence, as the specification requires.
        if (candidate[0] !== unitId) continue;
        instrument.touch();
        const reply = respond(candidate);
        if (reply) responses.push(reply);
      }
      return responses;
    },
  };
}
