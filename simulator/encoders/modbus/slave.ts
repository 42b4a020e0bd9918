import type { Frame } from '../../../shared/schemas/frame.js';
import { hasValidCrc, withCrc } from './crc16.js';
import { DEFAULT_REGISTER_MAP, frameToRegisters, type RegisterMap } from './register-map.js';

export const READ_HOLDING_REGISTERS = 0x03;
export const READ_INPUT_REGISTERS = 0x04;
export const EXCEPTION_ILLEGAL_FUNCTION = 0x01;
export const EXCEPTION_ILLEGAL_DATA_ADDRESS = 0x02;
export const EXCEPTION_ILLEGAL_DATA_VALUE = 0x03;
/** A read request is address, function, start (2), quantity (2) and CRC (2). */
const REQUEST_BYTES = 8;
/** Modbus allows at most 125 registers in one read (specification, function 03). */
const MAX_READ_REGISTERS = 125;
const EXCEPTION_FLAG = 0x80;
/** Bytes kept while hunting for a frame start; beyond this the buffer is line noise. */
const MAX_BUFFER_BYTES = 256;

/** A Modbus RTU slave serving a meter's latest reading as holding registers. */
export interface ModbusSlave {
  update(frame: Frame): void;
  /** Feeds received bytes; returns the responses to complete requests addressed to this unit. */
  receive(bytes: Uint8Array): Uint8Array[];
  /** Forgets a partial request: what the 3.5-character silence does on a real line. */
  resetFraming(): void;
}

/**
 * Creates a slave. Functions 03 and 04 read the same register image; other functions get
 * exception 01; reads past the map get 02; bad CRCs and other units' requests get silence,
 * as the specification requires.
 */
export function createModbusSlave(unitId = 1, map: RegisterMap = DEFAULT_REGISTER_MAP): ModbusSlave {
  let image = frameToRegisters(undefined, map);
  let buffer = new Uint8Array(0);

  const respond = (request: Uint8Array): Uint8Array | undefined => {
    const functionCode = request[1];
    if (request[0] !== unitId) return undefined;
    const exception = (code: number) => withCrc(Uint8Array.of(unitId, functionCode | EXCEPTION_FLAG, code));
    if (functionCode !== READ_HOLDING_REGISTERS && functionCode !== READ_INPUT_REGISTERS) return exception(EXCEPTION_ILLEGAL_FUNCTION);
    const start = (request[2] << 8) | request[3];
    const quantity = (request[4] << 8) | request[5];
    if (quantity < 1 || quantity > MAX_READ_REGISTERS) return exception(EXCEPTION_ILLEGAL_DATA_VALUE);
    if (start + quantity > image.length) return exception(EXCEPTION_ILLEGAL_DATA_ADDRESS);
    const body = new Uint8Array(3 + quantity * 2);
    body[0] = unitId;
    body[1] = functionCode;
    body[2] = quantity * 2;
    for (let i = 0; i < quantity; i += 1) {
      body[3 + i * 2] = image[start + i] >>> 8;
      body[4 + i * 2] = image[start + i] & 0xff;
    }
    return withCrc(body);
  };

  return {
    update(frame) {
      image = frameToRegisters(frame, map);
    },
    resetFraming() {
      buffer = new Uint8Array(0);
    },
    receive(bytes) {
      const joined = new Uint8Array(buffer.length + bytes.length);
      joined.set(buffer);
      joined.set(bytes, buffer.length);
      buffer = joined.length > MAX_BUFFER_BYTES ? joined.slice(joined.length - MAX_BUFFER_BYTES) : joined;
      const responses: Uint8Array[] = [];
      // Without timing on a pseudo-terminal, frames are found by length and CRC; a bad
      // candidate costs one byte and the hunt goes on (resynchronisation).
      while (buffer.length >= REQUEST_BYTES) {
        const candidate = buffer.subarray(0, REQUEST_BYTES);
        if (!hasValidCrc(candidate)) {
          buffer = buffer.slice(1);
          continue;
        }
        const reply = respond(candidate);
        if (reply) responses.push(reply);
        buffer = buffer.slice(REQUEST_BYTES);
      }
      return responses;
    },
  };
}
