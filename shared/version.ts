/** Version of the engineering core; responses and frozen snapshots carry it. Bump on any change of results. */
export const ENGINE_VERSION = '0.1.0';
