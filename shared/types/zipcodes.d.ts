// The zipcodes package ships no types; only what we use is declared.
declare module 'zipcodes' {
  export interface ZipCode {
    zip: string;
    latitude: number;
    longitude: number;
    city: string;
    state: string;
    country: string;
  }
  export function lookup(zip: string | number): ZipCode | undefined;
  const zipcodes: { lookup: typeof lookup };
  export default zipcodes;
}
