import type { MediaType } from '@shared/vocabulary';
import { Alert } from '@/components/ui/alert';

// Brief reminders where the technician acts. General rules only: the lab's licensed practice, its
// safety procedures and the equipment makers' manuals decide.

interface Reminder {
  title: string;
  text: string;
}

const openDrive: Reminder = {
  title: 'Open the drive only on the clean-air bench',
  text: 'A head-disk assembly opened outside the certified clean area takes in particles that scratch the platters. Use the lab’s clean-air bench and its procedure for every head swap or platter job.',
};
const heatWork: Reminder = {
  title: 'Heat work on boards',
  text: 'Hot air and reflow work on boards and chips call for fume extraction, eye protection and the station maker’s settings; keep flammables away and let parts cool before handling.',
};
const lithium: Reminder = {
  title: 'Lithium battery',
  text: 'Disconnect or remove the battery before board work. Never charge, puncture or heat a swollen, damaged or leaking cell; isolate it in a non-combustible container and follow the lab’s battery procedure.',
};

const remindersFor = (mediaType: MediaType, hasBattery: boolean): Reminder[] => {
  const list: Reminder[] = [];
  if (mediaType === 'hdd_3_5' || mediaType === 'hdd_2_5' || mediaType === 'raid_nas') list.push(openDrive);
  if (['ssd_sata', 'ssd_m2_nvme', 'usb_flash', 'memory_card', 'phone', 'tablet', 'hdd_3_5', 'hdd_2_5'].includes(mediaType)) list.push(heatWork);
  if (hasBattery || mediaType === 'phone' || mediaType === 'tablet') list.push(lithium);
  return list;
};

/** The usual cautions for this kind of device, shown where the bench work is recorded. */
export function BenchSafety({ mediaType, hasBattery }: { mediaType: MediaType; hasBattery: boolean }) {
  const reminders = remindersFor(mediaType, hasBattery);
  if (reminders.length === 0) return null;
  return (
    <Alert tone="warning" title="At the bench">
      <ul className="mt-1 flex flex-col gap-1.5">
        {reminders.map((r) => (
          <li key={r.title}>
            <span className="font-semibold">{r.title}.</span> {r.text}
          </li>
        ))}
      </ul>
      <p className="mt-2 text-xs">These are general reminders; your lab’s licensed practice and the makers’ manuals decide.</p>
    </Alert>
  );
}
