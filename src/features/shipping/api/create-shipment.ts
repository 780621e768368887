import { useMutation } from '@tanstack/react-query';
import { createShipmentInput, shipmentDto, type CreateShipmentInput, type ShipmentDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';

export { createShipmentInput };

/** Rates for a box: the shipment is stored with them, not bought. */
export function createShipment({ referralId, input }: { referralId: string; input: CreateShipmentInput }): Promise<ShipmentDto> {
  return api.post(`/referrals/${encodeURIComponent(referralId)}/shipments`, { body: input, schema: shipmentDto });
}

export function useCreateShipment() {
  return useMutation({ mutationFn: createShipment });
}
