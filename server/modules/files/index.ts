export { displayName, EXTENSION, MIME, sniffBytes, sniffFile, type SniffedType } from './sniff';
export { filesOlderThan, randomStoredName, removeLocal, removeQuietly, uploadDirs, type FileStorage, type UploadDirs } from './storage';
export { keysOf, stageUploads, type StoredKeys } from './stored-files';
