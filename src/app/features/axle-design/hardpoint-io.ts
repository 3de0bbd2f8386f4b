// Hardpoint file reading and writing lives in shared/io: one parser for the browser (paste, export) and the server (upload).
export * from '../../../../shared/io/hardpoints';
