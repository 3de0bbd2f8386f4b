// The CAD frame mapping lives in shared/io: the server applies it when it reads an uploaded file.
export * from '../../../../shared/io/cad-frame';
