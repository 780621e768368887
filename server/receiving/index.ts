export { CheckIn, CheckInPhoto, LabTransfer } from './entities';
export { receivingRoutes } from './routes';
export { inboundBoard, lookupBox, checkInBox, declineAfterArrival, releaseHold, parseScannedCode, openCheckInPhoto, BOARD_SQL, boardParams } from './service';
