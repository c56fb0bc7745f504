/** The SHA-256 of the C sources in `folder` (kernel-source-digest.mjs). */
export function kernelSourceDigest(folder: string): string;
