import { returnShipmentInput, shipmentDto, transferShipmentInput, type ReturnShipmentInput, type ShipmentDto, type TransferShipmentInput } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';

export { returnShipmentInput, transferShipmentInput };

/** Rates for the return of a device (to the shop or the customer); not bought yet. */
export function createReturn(referralId: string, input: ReturnShipmentInput): Promise<ShipmentDto> {
  return api.post(`/lab/cases/${encodeURIComponent(referralId)}/returns`, { body: input, schema: shipmentDto });
}

/** Rates for the transfer to the lab that took the case over; not bought yet. */
export function createTransfer(referralId: string, input: TransferShipmentInput): Promise<ShipmentDto> {
  return api.post(`/lab/cases/${encodeURIComponent(referralId)}/transfers`, { body: input, schema: shipmentDto });
}
