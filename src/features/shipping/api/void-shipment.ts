import { useMutation, useQueryClient } from '@tanstack/react-query';
import { shipmentDto, type ShipmentDto } from '@shared/schemas/shipping';
import { api } from '@/lib/api-client';
import { caseKeys, inboundKeys, shipmentKeys } from '@/lib/query-keys';

export function voidShipment(shipmentId: string): Promise<ShipmentDto> {
  return api.post(`/shipments/${encodeURIComponent(shipmentId)}/void`, { schema: shipmentDto });
}

export function useVoidShipment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: voidShipment,
    onSuccess: (shipment) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: shipmentKeys.all }),
        queryClient.invalidateQueries({ queryKey: caseKeys.detail(shipment.referralId) }),
        queryClient.invalidateQueries({ queryKey: inboundKeys.all }),
      ]),
  });
}
