export { displayName, EXTENSION, MIME, sniffBytes, sniffFile, type SniffedType } from './sniff';
export { filesOlderThan, moveAll, randomStoredName, removeQuietly, uploadDirs, type UploadDirs } from './storage';
