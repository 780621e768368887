import { parseReference } from '@shared/domain/reference';
import { isValidSscc } from '@shared/domain/sscc';

export type ScanCheck = { ok: true; code: string } | { ok: false; message: string };

/**
 * What a scanner (which types like a keyboard and ends with Enter) or a person entered, checked before
 * anything is looked up: a case reference's check symbol (Crockford Base 32, mod 37) and an SSCC's GS1
 * check digit. Tracking codes have no check the network knows for every carrier; the server looks them up.
 */
export function checkScannedCode(raw: string): ScanCheck {
  const compact = raw.trim().toUpperCase().replace(/\s+/g, '');
  if (!compact) return { ok: false, message: 'Scan or type a tracking code or a case reference.' };
  if (compact.replace(/-/g, '').startsWith('PP')) {
    const ref = parseReference(compact);
    return ref.ok ? { ok: true, code: ref.reference } : { ok: false, message: ref.message };
  }
  const sscc = /^(?:\(00\)|00)?(\d{18})$/.exec(compact.replace(/-/g, ''))?.[1];
  if (sscc) return isValidSscc(sscc) ? { ok: true, code: sscc } : { ok: false, message: 'The box code’s check digit does not match; scan it again.' };
  if (!/^[A-Z0-9-]{6,40}$/.test(compact)) return { ok: false, message: 'A tracking code has letters and digits only; a case reference starts with PP-.' };
  return { ok: true, code: compact.replace(/-/g, '') };
}
