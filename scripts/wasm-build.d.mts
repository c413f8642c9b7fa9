export const WAT_PATH: string;
export const BYTES_PATH: string;
export function wasmCompile(watText: string): Promise<Uint8Array>;
export function wasmModuleText(bytes: Uint8Array): string;
export function wasmBuild(): Promise<string>;
