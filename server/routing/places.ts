import zipcodes from 'zipcodes';
import { AppError } from '../lib/errors';

// Postal code → coordinates from the offline `zipcodes` data (US ZIP centroids and Canadian forward
// sortation areas); no network geocoding.

export interface Place {
  lat: number;
  lon: number;
  city: string;
  region: string;
  postalCode: string;
  country: 'US' | 'CA';
}

const countryOf: Record<string, 'US' | 'CA'> = { US: 'US', Canada: 'CA' };

export function lookupPostalCode(postalCode: string, country: string): Place | null {
  const code = postalCode.trim().toUpperCase();
  let key: string;
  if (country === 'US') {
    const m = /^(\d{5})(-\d{4})?$/.exec(code);
    if (!m) return null;
    key = m[1];
  } else if (country === 'CA') {
    const m = /^([A-Z]\d[A-Z])\s?(\d[A-Z]\d)?$/.exec(code);
    if (!m) return null;
    key = m[1];
  } else {
    return null;
  }
  const found = zipcodes.lookup(key);
  if (!found || countryOf[found.country] !== country) return null;
  return { lat: found.latitude, lon: found.longitude, city: found.city, region: found.state, postalCode: code, country };
}

/** The place of an address, or a 400 naming `<path>.postalCode`. */
export function resolvePostalCode(address: { postalCode: string; country: string }, path: string): Place {
  if (address.country !== 'US' && address.country !== 'CA') {
    throw AppError.validation([{ path: `${path}.country`, message: 'The network serves the US and Canada (US or CA)' }]);
  }
  const place = lookupPostalCode(address.postalCode, address.country);
  if (!place) {
    throw AppError.validation([{ path: `${path}.postalCode`, message: `Unknown ${address.country === 'US' ? 'ZIP code' : 'postal code'} "${address.postalCode}"` }]);
  }
  return place;
}
