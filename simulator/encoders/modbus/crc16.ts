/** Reflected polynomial 0x8005 as the Modbus over Serial Line specification (V1.02, §6.2.2) gives it. */
const POLYNOMIAL_REFLECTED = 0xa001;
const INITIAL = 0xffff;
const BITS_PER_BYTE = 8;

/** CRC-16 of a Modbus RTU frame (init 0xFFFF, reflected 0xA001); sent low byte first. */
export function modbusCrc16(bytes: Uint8Array): number {
  let crc = INITIAL;
  for (const byte of bytes) {
    crc ^= byte;
    for (let bit = 0; bit < BITS_PER_BYTE; bit += 1) {
      crc = crc & 1 ? (crc >>> 1) ^ POLYNOMIAL_REFLECTED : crc >>> 1;
    }
  }
  return crc;
}

/** Appends the CRC to a frame body, low byte first as the specification requires. */
export function withCrc(body: Uint8Array): Uint8Array {
  const crc = modbusCrc16(body);
  const frame = new Uint8Array(body.length + 2);
  frame.set(body);
  frame[body.length] = crc & 0xff;
  frame[body.length + 1] = crc >>> 8;
  return frame;
}

/** Whether a complete frame's last two bytes are the CRC of the rest. */
export function hasValidCrc(frame: Uint8Array): boolean {
  if (frame.length < 4) return false;
  const crc = modbusCrc16(frame.subarray(0, frame.length - 2));
  return frame[frame.length - 2] === (crc & 0xff) && frame[frame.length - 1] === crc >>> 8;
}
