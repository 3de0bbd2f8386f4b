// The hardpoint rows of a corner live in shared/io so the server's import reads them the same way.
export * from '../../../../shared/io/hardpoint-points';
