import { SerialPort } from 'serialport';
import type { SerialPortListResponse } from '../../shared/schemas/bench.js';

type PortLister = () => Promise<Array<{ path: string; manufacturer?: string; serialNumber?: string; vendorId?: string; productId?: string }>>;

const PTY_NOTE = 'Pseudo-terminals (for example a simulator link under /tmp) are never listed: type their path.';

/**
 * Lists the serial ports present. On Linux serialport asks udevadm; without udev installed
 * it fails with `spawn udevadm ENOENT`, which becomes an empty list and a message saying so.
 */
export async function listSerialPorts(list: PortLister = () => SerialPort.list()): Promise<SerialPortListResponse> {
  try {
    const ports = (await list()).map(({ path, manufacturer, serialNumber, vendorId, productId }) => ({
      path,
      ...(manufacturer && { manufacturer }),
      ...(serialNumber && { serialNumber }),
      ...(vendorId && { vendorId }),
      ...(productId && { productId }),
    }));
    return ports.length > 0 ? { ports } : { ports, message: `No serial ports found. ${PTY_NOTE}` };
  } catch (err) {
    const text = err instanceof Error ? err.message : String(err);
    if (/udevadm/.test(text) && /ENOENT/.test(text)) {
      return {
        ports: [],
        message: `Cannot list serial ports: this server lacks udev (udevadm not found; on Debian: apt-get install udev). Type the device path instead. ${PTY_NOTE}`,
      };
    }
    return { ports: [], message: `Cannot list serial ports: ${text}. Type the device path instead.` };
  }
}
