import { EventEmitter } from 'node:events';
import type { SerialPortLike } from './serial-port-factory.js';

/** Modbus RTU framing sizes (Modbus over Serial Line V1.02, 2.5.1): unit id + function + ... + CRC-16. */
const EXCEPTION_FRAME_BYTES = 5;
const READ_REPLY_OVERHEAD_BYTES = 5;
const WRITE_REPLY_BYTES = 8;
const EXCEPTION_FLAG = 0x80;
/** A reply never exceeds 256 bytes (the RTU ADU limit), so the buffer is bounded. */
const MAX_ADU_BYTES = 256;

/**
 * Lets modbus-serial's client talk over a port the serial source already opened. The
 * client wants one 'data' event per complete reply; a serial line delivers arbitrary
 * chunks, so this cuts replies by the length the request implies (modbus-serial's own
 * buffered port does the same but insists on opening the device itself).
 */
export class ModbusRtuPort extends EventEmitter {
  private buffer = Buffer.alloc(0);
  private unitId = 0;
  private functionCode = 0;
  private expectedBytes = 0;
  // modbus-serial keeps transaction ids on the port object.
  _transactionIdRead = 1;
  _transactionIdWrite = 1;

  constructor(private readonly port: SerialPortLike) {
    super();
    port.on('data', this.onData);
  }

  get isOpen(): boolean {
    return this.port.isOpen;
  }

  /** The port is already open; modbus-serial calls this first. */
  open(callback: (err: Error | null) => void): void {
    callback(null);
  }

  /** Detaches from the port; the serial source closes the port itself. */
  close(callback?: () => void): void {
    this.port.off('data', this.onData);
    callback?.();
  }

  /** Sends a request and remembers what reply length to expect. */
  write(data: Buffer): void {
    this.unitId = data[0] ?? 0;
    this.functionCode = data[1] ?? 0;
    const quantity = data.length >= 6 ? data.readUInt16BE(4) : 0;
    const isRead = this.functionCode === 3 || this.functionCode === 4;
    this.expectedBytes = isRead ? READ_REPLY_OVERHEAD_BYTES + 2 * quantity : WRITE_REPLY_BYTES;
    this.buffer = Buffer.alloc(0);
    this.port.write(data);
  }

  private readonly onData = (chunk: Buffer): void => {
    this.buffer = Buffer.concat([this.buffer, chunk]);
    if (this.buffer.length > MAX_ADU_BYTES) this.buffer = this.buffer.subarray(-MAX_ADU_BYTES);
    // Skip noise until a byte that can start the reply we wait for.
    while (this.buffer.length >= 2 && !this.startsReply()) this.buffer = this.buffer.subarray(1);
    if (this.buffer.length < 2) return;
    const isException = this.buffer[1] === (this.functionCode | EXCEPTION_FLAG);
    const length = isException ? EXCEPTION_FRAME_BYTES : this.expectedBytes;
    if (this.buffer.length < length) return;
    const reply = this.buffer.subarray(0, length);
    this.buffer = this.buffer.subarray(length);
    this.emit('data', reply);
  };

  private startsReply(): boolean {
    return this.buffer[0] === this.unitId && (this.buffer[1] === this.functionCode || this.buffer[1] === (this.functionCode | EXCEPTION_FLAG));
  }
}
