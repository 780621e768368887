import { useMutation, useQueryClient } from '@tanstack/react-query';
import { buyShipmentInput, shipmentDto, type ShipmentDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { caseKeys, inboundKeys, shipmentKeys } from '@/lib/query-keys';

export { buyShipmentInput };

/** Buys the label; safe to press again after an error (the server never buys twice). */
export function buyShipment({ shipmentId, rateId }: { shipmentId: string; rateId: string }): Promise<ShipmentDto> {
  return api.post(`/shipments/${encodeURIComponent(shipmentId)}/buy`, { body: { rateId }, schema: shipmentDto });
}

export function useBuyShipment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: buyShipment,
    onSuccess: (shipment) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: shipmentKeys.all }),
        queryClient.invalidateQueries({ queryKey: caseKeys.detail(shipment.referralId) }),
        queryClient.invalidateQueries({ queryKey: inboundKeys.all }),
      ]),
  });
}
