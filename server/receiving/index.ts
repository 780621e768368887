export { CheckIn, CheckInPhoto, LabTransfer } from './entities';
export { receivingRoutes } from './routes';
export { inboundBoard, lookupBox, checkInBox, declineAfterArrival, parseScannedCode, openCheckInPhoto, BOARD_SQL, boardParams } from './service';
