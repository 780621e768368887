export { ReferralPhoto } from './entities';
export { photoRoutes, receivePhotos, filesOf, sendPhoto, storageFromConfig } from './routes';
export { addReferralPhotos, listReferralPhotos, openPhoto, photoUrl, maySeeCase, type PhotoUploader, type PhotoViewer, type IncomingPhoto } from './service';
export { localDiskStorage, contentHash, type BlobStorage } from './storage';
export { detectPhotoType } from './image-type';
