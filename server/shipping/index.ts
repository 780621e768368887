export { Shipment, ShipmentScan, ShippingWebhookEvent, type StoredAddress } from './entities';
export { shippingRoutes, shippingWebhookRoutes, shippingPartnerApiRoutes } from './routes';
export { registerShippingJobs } from './jobs';
export { statusRank, toShipmentDto, type Channel } from './dto';
export {
  quoteInbound,
  buyShipment,
  voidShipment,
  getShipment,
  caseShipping,
  labelPdf,
  packingSlip,
  shipmentSummaries,
  shipmentDtoOf,
  settlePurchase,
  recordPurchase,
  holdingLab,
  checkInSummary,
  deviceLine,
  batteryFor,
  type ShippingViewer,
  type ShippingActor,
} from './service';
export { quoteReturn, quoteTransfer, listOutbound } from './outbound';
export { handleShippingWebhook, applyTracker, reconcileShipments, markOverdueShipments, ensureWebhookRegistered, mapTrackerStatus } from './tracking';
export { carrierClient } from './carrier';
export { packingSlipPdf, slipBarcodes, SLIP_WIDTH_PT, SLIP_HEIGHT_PT } from './slip';
