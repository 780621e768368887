import { describe, expect, it } from 'vitest';
import { lookupPostalCode, resolvePostalCode } from './places';

// Offline postal-code centroids from the zipcodes package (US ZIP codes, Canadian FSAs).
describe('lookupPostalCode', () => {
  it('finds a US ZIP code, also written as ZIP+4', () => {
    const phoenix = lookupPostalCode('85004', 'US');
    expect(phoenix).toMatchObject({ city: 'Phoenix', region: 'AZ', country: 'US', postalCode: '85004' });
    expect(lookupPostalCode('85004-1234', 'US')).toMatchObject({ lat: phoenix!.lat, lon: phoenix!.lon });
  });

  it('finds a Canadian postal code by its forward sortation area', () => {
    expect(lookupPostalCode('M5V 3L9', 'CA')).toMatchObject({ country: 'CA', region: 'Ontario' });
  });

  it('answers null for an unknown code, a malformed one, or a code of the other country', () => {
    expect(lookupPostalCode('00000', 'US')).toBeNull();
    expect(lookupPostalCode('8500', 'US')).toBeNull();
    expect(lookupPostalCode('85004', 'CA')).toBeNull();
    expect(lookupPostalCode('M5V 3L9', 'US')).toBeNull();
  });
});

describe('resolvePostalCode', () => {
  it('names the field of an unknown code or an unserved country', () => {
    expect(() => resolvePostalCode({ postalCode: '00000', country: 'US' }, 'origin')).toThrow(
      expect.objectContaining({ status: 400, fields: [{ path: 'origin.postalCode', message: 'Unknown ZIP code "00000"' }] }),
    );
    expect(() => resolvePostalCode({ postalCode: '10115', country: 'DE' }, 'address')).toThrow(
      expect.objectContaining({ fields: [{ path: 'address.country', message: expect.any(String) }] }),
    );
  });
});
