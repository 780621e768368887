import type { DeviceInterface } from '@shared/schemas/referrals';

/** Connections in the words on the drive or the cable. */
export const interfaceLabels: Record<DeviceInterface, string> = {
  sata: 'SATA',
  sas: 'SAS',
  pata: 'IDE / PATA',
  nvme: 'NVMe',
  usb: 'USB',
  thunderbolt: 'Thunderbolt',
  sd: 'SD card',
  microsd: 'microSD card',
  compact_flash: 'CompactFlash',
  lightning: 'Lightning',
  usb_c: 'USB-C',
  proprietary: 'Maker’s own connector',
  other: 'Something else',
};
